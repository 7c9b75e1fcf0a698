import { navItemsFor } from "@/app/_lib/capabilities";
import { getSession } from "@/app/_lib/dal";
import { AppShell } from "@/components/shell/app-shell";
import { type NavItem, navItems } from "@/components/shell/nav-items";
import { Mono } from "@/components/ui/mono";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { StatusBadge } from "@/components/ui/status-badge";

const audiences = [
  {
    who: "Trainers",
    work: "build a lab bench with faults to find, write the scenario that grades it and assign it to a class.",
  },
  {
    who: "Apprentices",
    work: "open an assigned lab, send telegrams from a control pad, watch status objects and the telegram log, and submit an attempt.",
  },
  {
    who: "Engineers",
    work: "model a project before the site visit, dry-run scenes and HVAC gateway behaviour, check bus load and export a test report.",
  },
  {
    who: "QA",
    work: "replay saved scenarios and suites, in the app or headless in CI, and read the run history and its failures.",
  },
  {
    who: "Admins",
    work: "manage the workspace, its members and their roles.",
  },
] as const;

/** What a signed-out visitor can open: the studio pages would only redirect to it. */
const signedOutItems: readonly NavItem[] = [
  {
    href: "/sign-in",
    label: "Sign in",
    summary: "Sign in to open your workspace's benches, scenarios and labs.",
    ready: true,
  },
];

export default async function HomePage() {
  // The home page is public; the navigation offers the studio only to someone signed in,
  // so a visitor's browser never prefetches pages that would redirect to sign-in.
  const session = await getSession();
  return (
    <AppShell items={session ? navItemsFor(session.role, navItems) : signedOutItems}>
      <div className="mx-auto flex max-w-5xl flex-col gap-8 px-6 py-8 md:px-10">
        <PageHeader
          title="A KNX test bench in the browser"
          lead="Prove that every group address does what the plan says before anyone drives to site."
        />

        <section className="grid gap-6 md:grid-cols-[3fr_2fr]">
          <div className="space-y-4 leading-relaxed">
            <p>
              Benchline simulates a KNX installation as a bus you can poke: devices with their group
              objects and flags, group addresses linking them, HVAC gateways talking to indoor and
              outdoor units, push-buttons, sensors and window contacts. Send a write or a read, and
              watch each telegram cross the line with its real timing, acknowledgement and repeats,
              and each status object answer.
            </p>
            <p>
              Checks you would otherwise do by hand on commissioning day become{" "}
              <strong>scenarios</strong>: telegram sequences in virtual time with the feedback they
              expect. Runs are reproducible, so the same scenario gives the same verdict in the app,
              in a training lab and in CI.
            </p>
          </div>
          <Panel title="On the bus">
            <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-2 text-sm">
              <dt className="text-ink-soft">send</dt>
              <dd>
                <Mono>3/1/2</Mono> setpoint 21.00 °C, DPT <Mono>9.001</Mono>
              </dd>
              <dt className="text-ink-soft">frame data</dt>
              <dd>
                <Mono className="text-copper-deep">0C 1A</Mono>
              </dd>
              <dt className="text-ink-soft">expect</dt>
              <dd>
                <Mono>3/1/3</Mono> setpoint status 21.00 °C within 500 ms
              </dd>
              <dt className="text-ink-soft">verdict</dt>
              <dd>
                <StatusBadge tone="healthy">pass</StatusBadge>
              </dd>
            </dl>
          </Panel>
        </section>

        <section aria-labelledby="who">
          <h2 id="who" className="mb-3 text-lg font-semibold">
            Who it is for
          </h2>
          <ul className="divide-y divide-paper-line rounded-lg border border-paper-line bg-paper">
            {audiences.map((audience) => (
              <li key={audience.who} className="grid gap-1 px-4 py-3 md:grid-cols-[9rem_1fr]">
                <span className="font-medium">{audience.who}</span>
                <span className="text-ink-soft">{audience.work}</span>
              </li>
            ))}
          </ul>
        </section>

        <section aria-labelledby="sections">
          <h2 id="sections" className="mb-3 text-lg font-semibold">
            In the studio
          </h2>
          <ul className="grid gap-3 sm:grid-cols-2">
            {navItems.map((item) => (
              <li key={item.href} className="rounded-lg border border-paper-line bg-paper p-4">
                <div className="flex items-center justify-between gap-2">
                  <span className="font-medium">{item.label}</span>
                  {item.ready ? null : <StatusBadge tone="neutral">soon</StatusBadge>}
                </div>
                <p className="mt-1 text-sm text-ink-soft">{item.summary}</p>
              </li>
            ))}
          </ul>
        </section>

        <aside
          role="note"
          aria-label="Caution"
          className="rounded-lg border border-copper/40 border-l-4 border-l-copper bg-paper-deep p-4 text-sm"
        >
          <p className="font-semibold">Caution</p>
          <p className="mt-1 text-ink-soft">
            Benchline is a simulator for planning, testing and training. It does not replace the
            manufacturer&apos;s installation and commissioning instructions, local codes and
            regulations, or the work of a licensed electrician or HVAC technician. Always verify on
            the real installation.
          </p>
        </aside>
      </div>
    </AppShell>
  );
}
