import type { Page } from "playwright-core";
import { inject } from "vitest";
import { demoPeople } from "../../../db/demo-world";

/** The invented demo password of a seeded demo person (db/demo-world.ts). */
export function demoPassword(email: string): string {
  const person = demoPeople.find((p) => p.email === email);
  if (!person) throw new Error(`${email} is not a demo person (db/demo-world.ts)`);
  return person.password;
}

/**
 * Sign in through the real sign-in page and wait until the studio shows the
 * signed-in account. Lands on `next` (default /benches); pass the page you
 * want to open to save a navigation.
 */
export async function signIn(
  page: Page,
  email: string,
  password: string,
  next = "/benches",
): Promise<void> {
  const baseURL = inject("baseURL");
  await page.goto(`${baseURL}/sign-in?next=${encodeURIComponent(next)}`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await Promise.all([
    page.waitForURL((url) => !url.pathname.startsWith("/sign-in"), { timeout: 30_000 }),
    page.getByRole("button", { name: "Sign in" }).click(),
  ]);
}
