import type { Route } from "./+types/home";

export function meta(_: Route.MetaArgs) {
  return [{ title: "Strutwise — truss optimization desk" }];
}

export default function Home() {
  return (
    <section className="max-w-3xl">
      <p className="font-mono text-sm text-brass-strong">optimization desk</p>
      <h1 className="mt-2 text-4xl font-semibold tracking-tight">Less steel, same safety margin.</h1>
      <p className="mt-4 text-lg text-ink-soft">
        Upload a truss, queue a sizing or shape run, watch it converge, and hand the result to a
        checker before it goes into the project file.
      </p>
    </section>
  );
}
