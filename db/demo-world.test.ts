import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { demoPeople, demoWorkspaces } from "./demo-world";
import { roles } from "./schema";

describe("demo world", () => {
  it("has one Fernhill member per role and the engineer also in Quayside Dental", () => {
    const fernhillRoles = demoPeople.flatMap((person) =>
      person.memberships.filter((m) => m.workspace === "fernhill").map((m) => m.role),
    );
    expect([...fernhillRoles].sort()).toEqual([...roles].sort());
    const quayside = demoPeople.filter((person) =>
      person.memberships.some((m) => m.workspace === "quayside-dental" && m.role === "engineer"),
    );
    expect(quayside).toHaveLength(1);
    expect(demoWorkspaces.map((w) => w.name)).toContain("Fernhill Training Centre");
  });

  it("uses only the reserved .example domain for e-mail (RFC 2606 §2)", () => {
    for (const person of demoPeople) expect(person.email).toMatch(/^[a-z.]+@[a-z-]+\.example$/);
  });

  it("is documented in the README sign-in table, row for row", () => {
    const readme = readFileSync("README.md", "utf8");
    for (const person of demoPeople) {
      const row = readme.split("\n").find((line) => line.includes(`\`${person.email}\``));
      expect(row, `README row for ${person.email}`).toBeDefined();
      expect(row).toContain(`\`${person.password}\``);
      expect(row).toContain(person.name);
    }
  });
});
