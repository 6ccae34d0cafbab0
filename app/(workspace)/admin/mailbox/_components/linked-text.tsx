/** Plain text with its http(s) addresses made into links; everything else stays escaped text. */
const URL_PATTERN = /(https?:\/\/[^\s<>"']+)/g;
const TRAILING = /[.,;:!?)\]]+$/;

export function LinkedText({ text }: { text: string }) {
  const parts = text.split(URL_PATTERN);
  return (
    <>
      {parts.map((part, i) => {
        if (i % 2 === 0) return part;
        const trail = part.match(TRAILING)?.[0] ?? "";
        const href = trail ? part.slice(0, -trail.length) : part;
        return (
          <span key={i}>
            <a href={href} className="break-all text-tide-700 underline underline-offset-2 hover:text-tide-800">
              {href}
            </a>
            {trail}
          </span>
        );
      })}
    </>
  );
}
