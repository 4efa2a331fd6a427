/** Sets the document title for the current page; React 19 hoists <title> into <head>. */
export function PageTitle({ title }: { title: string }) {
  return <title>{`${title} · Steadyhand`}</title>;
}
