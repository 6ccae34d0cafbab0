"use client";
/** Last resort when the root layout itself fails: own document, no error details shown. */
export default function GlobalError({ retry }: { error: unknown; retry: () => void }) {
  return (
    <html lang="en">
      <body style={{ fontFamily: "system-ui, sans-serif", background: "#fbfaf6", color: "#161d27", margin: 0 }}>
        <main style={{ maxWidth: 520, margin: "15vh auto", padding: "0 24px" }}>
          <title>Something went wrong · Fieldtide</title>
          <h1 style={{ fontSize: 24, fontWeight: 600 }}>Something went wrong</h1>
          <p>Fieldtide could not show this page. Try again in a moment.</p>
          <button type="button" onClick={() => retry()} style={{ padding: "8px 14px", borderRadius: 6, border: 0, background: "#0f665d", color: "white", fontSize: 14 }}>
            Try again
          </button>
        </main>
      </body>
    </html>
  );
}
