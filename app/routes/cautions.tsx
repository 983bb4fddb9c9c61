import type { Route } from "./+types/cautions";

export const meta: Route.MetaFunction = () => [{ title: "Cautions · Visitwort" }];

export default function Cautions() {
  return (
    <article className="max-w-2xl space-y-6">
      <h1 className="text-3xl sm:text-4xl">Cautions</h1>
      <p>
        Monitoring bees and planting for them can harm what it means to help. These are the usual cautions; where
        your local regulations or a qualified practitioner say more, follow them.
      </p>
      <section className="space-y-2">
        <h2 className="text-2xl">Endangered bees</h2>
        <p>
          Some bumble bees are listed as endangered, among them the rusty patched bumble bee (<i>Bombus affinis</i>),
          listed in the United States in 2017. Never capture, handle or disturb an endangered bee: photograph it only.
          Handling or collecting a listed species may need a permit.
        </p>
        <p>
          The exact places where sensitive species are seen are shown only to the programme’s coordinators and the
          person who recorded them; everyone else sees a generalised location.
        </p>
      </section>
      <section className="space-y-2">
        <h2 className="text-2xl">Private land and access</h2>
        <p>
          Record only where you may be. Ask landowners before entering private land, keep to paths and access rules in
          reserves, and do not trample the flowers you are recording.
        </p>
      </section>
      <section className="space-y-2">
        <h2 className="text-2xl">Planting</h2>
        <ul className="list-disc space-y-1 pl-5">
          <li>Check your state’s or province’s noxious-weed and invasive-plant rules before planting anything.</li>
          <li>Ask nurseries for stock grown without systemic insecticides (such as neonicotinoids), which can reach nectar and pollen.</li>
          <li>Prefer local ecotypes: seed and plants from your own region.</li>
          <li>Herbicide use, for site preparation or removing invasive plants, follows the product label and the law; take qualified advice.</li>
        </ul>
      </section>
    </article>
  );
}
