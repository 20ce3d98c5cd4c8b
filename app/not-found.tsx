import Link from "next/link";

export default function NotFound() {
  return (
    <main className="mx-auto max-w-lg px-6 py-24 text-center">
      <p className="text-sm font-semibold text-accent-700">404</p>
      <h1 className="mt-2 text-2xl font-semibold text-ink-950">Nothing here</h1>
      <p className="mt-2 text-sm text-ink-600">The page may have moved, or the link is mistyped.</p>
      <Link href="/" className="mt-6 inline-block text-sm font-medium text-accent-700 hover:underline">
        Back to the overview
      </Link>
    </main>
  );
}
