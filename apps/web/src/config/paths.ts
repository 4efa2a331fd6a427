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
  admin: {
    protocol: {
      path: '/admin/protocol',
      getHref: () => '/admin/protocol',
    },
    /** People, places, sessions and the audit trail share one frame under /admin. */
    area: {
      path: '/admin',
      getHref: () => '/admin',
    },
    people: {
      path: '/admin/people',
      getHref: () => '/admin/people',
    },
    places: {
      path: '/admin/places',
      getHref: () => '/admin/places',
    },
    sessions: {
      path: '/admin/sessions',
      getHref: () => '/admin/sessions',
    },
    audit: {
      path: '/admin/audit',
      getHref: () => '/admin/audit',
    },
    /** The database copies and their checks. */
    backups: {
      path: '/admin/backups',
      getHref: () => '/admin/backups',
    },
    /** Mail caught by the development relay (FAKE_SMTP=1). */
    outbox: {
      path: '/admin/outbox',
      getHref: () => '/admin/outbox',
    },
  },
  account: {
    home: {
      path: '/account',
      getHref: () => '/account',
    },
    password: {
      path: '/account/password',
      getHref: (next?: string) => (next ? `/account/password?next=${encodeURIComponent(next)}` : '/account/password'),
    },
    secondFactor: {
      path: '/account/second-factor',
      getHref: (next?: string) => (next ? `/account/second-factor?next=${encodeURIComponent(next)}` : '/account/second-factor'),
    },
  },
  pharmacy: {
    worklist: {
      path: '/pharmacy',
      getHref: () => '/pharmacy',
    },
    code: {
      path: '/pharmacy/codes/:codeId',
      getHref: (codeId: string) => `/pharmacy/codes/${encodeURIComponent(codeId)}`,
    },
    trays: {
      path: '/pharmacy/trays',
      getHref: () => '/pharmacy/trays',
    },
  },
  codes: {
    record: {
      path: '/codes/:codeId/record',
      getHref: (codeId: string) => `/codes/${encodeURIComponent(codeId)}/record`,
    },
    /** After the code: complete, correct, attach, sign and print its record. */
    review: {
      path: '/codes/:codeId/review',
      getHref: (codeId: string) => `/codes/${encodeURIComponent(codeId)}/review`,
    },
    /** The timer wall for one code: the leader's screen across the room. */
    wall: {
      path: '/codes/:codeId/wall',
      getHref: (codeId: string) => `/codes/${encodeURIComponent(codeId)}/wall`,
    },
  },
  records: {
    /** Ended codes and how far each record is signed. */
    list: {
      path: '/records',
      getHref: () => '/records',
    },
    /** Anyone holding a printed record (or its digest) can check it here. */
    verify: {
      path: '/records/verify',
      getHref: () => '/records/verify',
    },
  },
  /** The board of every live code, each card opening its wall. */
  wallBoard: {
    path: '/wall',
    getHref: () => '/wall',
  },
  quality: {
    list: {
      path: '/quality',
      getHref: () => '/quality',
    },
    stats: {
      path: '/quality/stats',
      getHref: () => '/quality/stats',
    },
    /** Ended codes still waiting for their follow-up after discharge. */
    followUp: {
      path: '/quality/follow-up',
      getHref: () => '/quality/follow-up',
    },
    code: {
      path: '/quality/codes/:codeId',
      getHref: (codeId: string) => `/quality/codes/${encodeURIComponent(codeId)}`,
    },
  },
} as const;
