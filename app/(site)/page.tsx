import Link from 'next/link';

export default function HomePage() {
  return (
    <div className="mx-auto max-w-3xl space-y-8 py-8">
      <section className="space-y-3">
        <h1 className="text-3xl font-semibold tracking-tight">Will this filter pass your line on your optic?</h1>
        <p className="text-lg leading-relaxed">
          Bandcone is a shared library of measured narrowband filter curves, each with its test method and checked by a
          moderator. Run any curve through the light cone of your own optic to see how much of the emission line reaches
          the sensor, which pre-shift suits it, and how much speed you lose.
        </p>
      </section>
      <form action="/curves" method="get" role="search" className="flex gap-2">
        <label htmlFor="home-q" className="sr-only">Search the catalogue</label>
        <input
          id="home-q"
          name="q"
          placeholder="Search curves: H-alpha 4.5 nm, dual band, a maker or lab…"
          className="min-w-0 flex-1 rounded-card border border-rule bg-panel px-3 py-2"
        />
        <button className="rounded-card bg-accent px-4 py-2 text-accent-ink">Search</button>
      </form>
      <ul className="grid gap-3 sm:grid-cols-3 text-sm">
        <li className="rounded-card border border-rule bg-panel p-4">
          <Link className="font-medium text-accent" href="/curves">Catalogue</Link>
          <p className="mt-1 text-muted">Find verified curves by words, numbers and fitness for an optic.</p>
        </li>
        <li className="rounded-card border border-rule bg-panel p-4">
          <Link className="font-medium text-accent" href="/study">Cone study</Link>
          <p className="mt-1 text-muted">See what an f/2 cone and a central obstruction do to a passband.</p>
        </li>
        <li className="rounded-card border border-rule bg-panel p-4">
          <Link className="font-medium text-accent" href="/submit">Contribute</Link>
          <p className="mt-1 text-muted">Upload a curve from your bench with its method; a moderator checks it.</p>
        </li>
      </ul>
    </div>
  );
}
