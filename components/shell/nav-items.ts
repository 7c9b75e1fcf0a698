/**
 * The studio navigation, defined once. A later page plugs in by adding its
 * route under app/ and setting `ready: true` here; until then the item is
 * listed but not linked, so the shell never points at a missing page.
 */
export interface NavItem {
  /** Route of the page, e.g. "/benches". */
  readonly href: string;
  readonly label: string;
  /** One line shown as the link's title and on the home page. */
  readonly summary: string;
  /** False while the page is not built yet: shown greyed out, not as a link. */
  readonly ready: boolean;
}

export const navItems: readonly NavItem[] = [
  {
    href: "/benches",
    label: "Benches",
    summary: "Build an installation: devices, group addresses and the links between them.",
    ready: true,
  },
  {
    href: "/console",
    label: "Live console",
    summary: "Run a bench, send telegrams from a control pad and watch the telegram log.",
    ready: true,
  },
  {
    href: "/scenarios",
    label: "Scenarios",
    summary: "Telegram sequences in virtual time with the status feedback they expect.",
    ready: true,
  },
  {
    href: "/runs",
    label: "Runs",
    summary: "Replays of scenarios and suites with per-step verdicts and traces.",
    ready: true,
  },
  {
    href: "/labs",
    label: "Labs",
    summary: "Training benches with faults to find, assigned to apprentices and graded.",
    ready: true,
  },
  {
    href: "/members",
    label: "Members",
    summary: "Who belongs to the workspace and in which role.",
    ready: true,
  },
  {
    href: "/outbox",
    label: "Outbox",
    summary: "Invitation and password-reset mail the app has sent or queued.",
    ready: true,
  },
];
