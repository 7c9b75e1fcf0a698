import { describe, expect, it } from "vitest";
import { openDatabase } from "./client";
import { preparedPer } from "./prepared";

describe("statements prepared per connection", () => {
  it("builds once per connection and never shares a statement between connections", () => {
    let built = 0;
    const statement = preparedPer((db) => {
      built += 1;
      return db.$client.prepare("select 1 as one");
    });
    const first = openDatabase(":memory:", { migrate: false });
    const second = openDatabase(":memory:", { migrate: false });
    try {
      expect(statement(first)).toBe(statement(first));
      expect(statement(second)).not.toBe(statement(first));
      expect(built).toBe(2);
      expect(statement(second).get()).toEqual({ one: 1 });
    } finally {
      first.$client.close();
      second.$client.close();
    }
  });
});
