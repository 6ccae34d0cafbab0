export default function HomePage() {
  return (
    <main className="mx-auto max-w-2xl p-8">
      <h1 className="text-2xl font-semibold">Fieldtide</h1>
      <p className="mt-2 text-ink-600">Ground magnetic survey logs, diurnally corrected.</p>
    </main>
  );
}
