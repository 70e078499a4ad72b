import Link from "next/link";
import { buttonClass } from "@/components/ui/button";

const CHECKS = [
  {
    title: "Cascade response",
    body: "Magnitude and phase of the whole chain and of every stage, with corners, band edges and the converter's Nyquist frequency marked.",
  },
  {
    title: "Rails and headroom",
    body: "Each stage's DC interval and signal peak against the swing its op-amp can really reach, with the reason named when a stage runs into a rail.",
  },
  {
    title: "Noise against the converter",
    body: "Resistor, amplifier and sensor noise carried to the ADC, compared with its quantisation noise, giving SNR and effective bits.",
  },
  {
    title: "Spread over part tolerances",
    body: "Monte Carlo builds and worst-case corners over every resistor and capacitor, which part moves what, and standard values with a preview.",
  },
  {
    title: "Steps and recordings",
    body: "A step, burst or chirp, or a recording of the real sensor, run through every stage with each op-amp held to its rails and slew rate, so you see where a stage clips and how long it takes to recover.",
  },
];

export default function LandingPage() {
  return (
    <div className="mx-auto max-w-5xl px-6 py-14">
      <section className="max-w-3xl">
        <p className="text-sm font-medium uppercase tracking-wide text-accent-700">Sensor to converter</p>
        <h1 className="mt-2 text-4xl font-semibold leading-tight tracking-tight text-graphite-950">
          Plan the op-amp stages between a sensor and its ADC, and see early which one will sit on a rail.
        </h1>
        <p className="mt-5 text-lg text-graphite-700">
          Chainwright is a shared workspace for analog front-end work. Sketch the chain from a bridge, accelerometer,
          photodiode or thermocouple to the converter; Chainwright works out gain, filtering, headroom at DC and at the
          signal peak, and noise, and keeps the design, its reviews and its history in one place for the whole team.
        </p>
        <div className="mt-8 flex gap-3">
          <Link href="/sign-up" className={buttonClass("primary", "px-5 py-2.5 text-base")}>
            Create an account
          </Link>
          <Link href="/sign-in" className={buttonClass("secondary", "px-5 py-2.5 text-base")}>
            Sign in
          </Link>
        </div>
      </section>

      <section aria-labelledby="checks" className="mt-16">
        <h2 id="checks" className="text-lg font-semibold text-graphite-950">
          What it checks
        </h2>
        <ul className="mt-4 grid gap-4 sm:grid-cols-2">
          {CHECKS.map((c) => (
            <li key={c.title} className="rounded-card border border-paper-rule bg-paper-raised p-5 shadow-card">
              <h3 className="font-medium text-graphite-950">{c.title}</h3>
              <p className="mt-1.5 text-sm text-graphite-700">{c.body}</p>
            </li>
          ))}
        </ul>
      </section>

      <section aria-labelledby="team" className="mt-16 max-w-3xl">
        <h2 id="team" className="text-lg font-semibold text-graphite-950">
          For everyone around the design
        </h2>
        <p className="mt-2 text-graphite-700">
          Reviewers see the margins and approve or ask for changes, with comments on the chain and its whole history.
          The same analysis runs from the command line and the REST API. Each chain hands off to firmware (scaling
          from converter codes back to sensor units, as JSON or a C header), to test (the expected DC and AC at each
          test point), to purchasing (a bill of materials with standard values) and to print (a design report).
        </p>
      </section>
    </div>
  );
}
