import type { Role } from "./schema";

/**
 * The invented demo world. Every name, address and password here is made up;
 * the `.example` top-level domain is reserved and never delivers mail.
 * The passwords are listed in README.md; only their bcrypt hashes reach the database.
 */
export const demoWorkspaces = [
  { slug: "fernhill", name: "Fernhill Training Centre" },
  { slug: "quayside-dental", name: "Quayside Dental" },
  { slug: "wrenhallow", name: "Wrenhallow Hotel" },
] as const;

export type DemoWorkspaceSlug = (typeof demoWorkspaces)[number]["slug"];

export interface DemoPerson {
  readonly email: string;
  readonly name: string;
  readonly password: string;
  readonly memberships: readonly { readonly workspace: DemoWorkspaceSlug; readonly role: Role }[];
}

export const demoPeople: readonly DemoPerson[] = [
  {
    email: "ines.admin@fernhill.example",
    name: "Ines Marrow",
    password: "fernhill-admin-demo",
    memberships: [{ workspace: "fernhill", role: "admin" }],
  },
  {
    email: "ada.trainer@fernhill.example",
    name: "Ada Penhallow",
    password: "fernhill-trainer-demo",
    memberships: [{ workspace: "fernhill", role: "trainer" }],
  },
  {
    email: "tomas.engineer@fernhill.example",
    name: "Tomas Ravelin",
    password: "fernhill-engineer-demo",
    memberships: [
      { workspace: "fernhill", role: "engineer" },
      // The engineer's own projects live in workspaces of their own.
      { workspace: "quayside-dental", role: "engineer" },
      { workspace: "wrenhallow", role: "engineer" },
    ],
  },
  {
    email: "priya.qa@fernhill.example",
    name: "Priya Oakhurst",
    password: "fernhill-qa-demo",
    memberships: [{ workspace: "fernhill", role: "qa" }],
  },
  {
    email: "leo.apprentice@fernhill.example",
    name: "Leo Brackwater",
    password: "fernhill-apprentice-demo",
    memberships: [{ workspace: "fernhill", role: "apprentice" }],
  },
];

/** bcrypt cost factor for stored password hashes (2^12 rounds). */
export const passwordHashCost = 12;
