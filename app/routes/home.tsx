import { Link } from "react-router";
import type { Route } from "./+types/home";

export const meta: Route.MetaFunction = () => [
  { title: "Visitwort — which flowers feed bumble-bee queens" },
  { name: "description", content: "Record which flower a bumble bee visited; verify it; rank the forage; plant for the whole season." },
];

const steps = [
  { title: "Record a visit", body: "In the field, on a phone: which bee, which flower, where and when, with photos." },
  { title: "Verify", body: "Botanists confirm the plant and bee verifiers the bee, from the photos." },
  { title: "Rank the forage", body: "Verified visits become a bee × plant × month matrix and an early-spring ranking with its uncertainty." },
  { title: "Plant for the season", body: "Planners turn the ranking into a native planting list that keeps flowers from April to September." },
  { title: "Grow it", body: "Nurseries see what is recommended and declare stock grown without systemic insecticides." },
];

export default function Home() {
  return (
    <div className="space-y-8">
      <section className="space-y-3">
        <h1 className="text-4xl leading-tight sm:text-5xl">Which flowers feed the queens?</h1>
        <p className="max-w-2xl text-lg">
          Bumble-bee queens wake hungry in early spring, and a nest stands or falls on the flowers near it. Visitwort
          gathers volunteers’ records of the flowers bees visit, has them verified, and turns them into forage
          evidence and planting lists that fill the season.
        </p>
        <p>
          <Link to="/checklist" className="inline-flex min-h-11 items-center rounded-md bg-moss px-5 font-semibold text-paper no-underline hover:bg-moss-deep">
            Browse the plant checklist
          </Link>
        </p>
      </section>
      <section>
        <h2 className="mb-3 text-2xl">From a sighting to a planting</h2>
        <ol className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
          {steps.map((step, i) => (
            <li key={step.title} className="rounded-lg border border-ink/10 bg-white/50 p-4">
              <p className="font-display text-lg font-semibold">
                <span className="mr-2 text-pollen" aria-hidden="true">{i + 1}</span>
                {step.title}
              </p>
              <p className="text-[0.95rem] text-ink-soft">{step.body}</p>
            </li>
          ))}
        </ol>
      </section>
    </div>
  );
}
