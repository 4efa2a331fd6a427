/** Every page's path in one place, so links and redirects never drift apart. */
export const paths = {
  home: {
    path: '/',
    getHref: () => '/',
  },
  signIn: {
    path: '/sign-in',
    /** `next` is where to go after signing in; the sign-in page checks it again before use. */
    getHref: (next?: string | null) =>
      next && next !== '/' ? `/sign-in?next=${encodeURIComponent(next)}` : '/sign-in',
  },
  codes: {
    record: {
      path: '/codes/:codeId/record',
      getHref: (codeId: string) => `/codes/${encodeURIComponent(codeId)}/record`,
    },
  },
} as const;
