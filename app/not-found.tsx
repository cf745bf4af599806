import Link from 'next/link';

export default function NotFound() {
  return (
    <section className="mx-auto max-w-prose py-12">
      <h1 className="text-2xl font-bold">Not found</h1>
      <p className="mt-3 text-ink-muted">There is no page here, or it belongs to a project you are not a member of.</p>
      <p className="mt-6">
        <Link href="/" className="font-semibold text-accent underline hover:text-accent-hover">
          Back to the start page
        </Link>
      </p>
    </section>
  );
}
