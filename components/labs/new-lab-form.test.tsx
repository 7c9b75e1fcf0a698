import { act, cleanup, fireEvent, render, screen } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { NewLabForm, type LabBenchChoice } from "./new-lab-form";

vi.mock("next/navigation", () => ({ useRouter: () => ({ push: () => undefined }) }));
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

const hotel: LabBenchChoice = {
  id: "bench-hotel",
  name: "Wrenhallow Hotel",
  scenarios: [{ id: "scn-all-off", name: "Central all-off reaches every floor" }],
  groupAddresses: [{ address: "4/0/1", name: "All lights off", dpt: "1.001" }],
  links: [{ device: "pb-central", deviceName: "Central", object: 0, groupAddress: "4/0/1" }],
  couplers: [{ id: "lc-floor-2", name: "Floor 2 line coupler", address: "1.2.0" }],
};

describe("NewLabForm", () => {
  it("hides a stale filter table: a coupler and the address its table leaves out", async () => {
    const bodies: unknown[] = [];
    vi.stubGlobal(
      "fetch",
      vi.fn(async (_url: string, init: RequestInit) => {
        bodies.push(JSON.parse(String(init.body)));
        return new Response(JSON.stringify({ lab: { id: "lab-1" } }), { status: 201 });
      }),
    );
    render(<NewLabForm benches={[hotel]} />);
    fireEvent.change(screen.getByLabelText("Title"), { target: { value: "Floor 2 stays lit" } });
    fireEvent.change(screen.getByLabelText("Grading scenario"), {
      target: { value: "scn-all-off" },
    });
    fireEvent.click(screen.getByRole("button", { name: "Add hidden fault" }));
    fireEvent.change(screen.getByLabelText("Hidden fault 1: kind"), {
      target: { value: "stale-filter-table" },
    });
    fireEvent.change(screen.getByLabelText("Hidden fault 1: coupler"), {
      target: { value: "lc-floor-2" },
    });
    fireEvent.change(screen.getByLabelText("Hidden fault 1: address left out"), {
      target: { value: "4/0/1" },
    });
    await act(async () => fireEvent.submit(screen.getByRole("form", { name: "New lab" })));
    expect(bodies).toEqual([
      expect.objectContaining({
        hiddenFaults: [
          { kind: "stale-filter-table", coupler: "lc-floor-2", groupAddress: "4/0/1" },
        ],
      }),
    ]);
  });
});
