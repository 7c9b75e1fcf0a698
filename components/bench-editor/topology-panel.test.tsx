import { act, cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { readFileSync } from "node:fs";
import { afterEach, describe, expect, it } from "vitest";
import { benchSchema, benchTopology, loadBench, type Bench } from "@/engine";
import { CouplerPanel } from "./coupler-panel";
import { EditorStoreProvider, useEditor } from "./store/editor-context";
import { createEditorStore } from "./store/editor-store";
import { TopologyPanel } from "./topology-panel";

afterEach(cleanup);

function hotel(): Bench {
  return benchSchema.parse(
    JSON.parse(readFileSync("scenarios/benches/wrenhallow-hotel.bench.json", "utf8")),
  );
}

/** The panels as the editor draws them: from the store's bench, topology worked out again. */
function Panels({ coupler }: { coupler?: string }) {
  const bench = useEditor((s) => s.bench);
  const loaded = loadBench(bench);
  const device = bench.devices.find((d) => d.id === coupler);
  return (
    <>
      <TopologyPanel
        bench={bench}
        topology={loaded.ok ? benchTopology(loaded.value) : null}
        readOnly={false}
        onOpenCoupler={() => undefined}
      />
      {device ? <CouplerPanel bench={bench} device={device} readOnly={false} /> : null}
    </>
  );
}

function mount(coupler?: string) {
  const store = createEditorStore(hotel());
  render(
    <EditorStoreProvider store={store}>
      <Panels {...(coupler ? { coupler } : {})} />
    </EditorStoreProvider>,
  );
  return store;
}

describe("TopologyPanel", () => {
  it("lists each line with its kind, device count, load and coupler", () => {
    mount();
    const area = screen.getByRole("region", { name: "Area 1" });
    expect(within(area).getByRole("heading").textContent).toContain("Hotel");
    const rows = within(area).getAllByRole("row").slice(1);
    expect(rows.map((r) => within(r).getByRole("rowheader").textContent)).toEqual([
      "1.0 Main linemain line",
      "1.1 Floor 1line",
      "1.2 Floor 2line",
      "1.3 Floor 3line",
    ]);
    expect(within(rows[2]!).getAllByRole("cell")[0]!.textContent).toBe("39");
    expect(within(rows[2]!).getAllByRole("cell")[1]!.textContent).toMatch(/^\d+\.\d %$/);
    expect(within(rows[2]!).getByRole("button").textContent).toBe("1.2.0 Floor 2 line coupler");
  });

  it("adds a line, then its coupler at the proposed address a.l.0", async () => {
    const store = mount();
    const form = screen.getByRole("form", { name: "Add a line" });
    fireEvent.change(within(form).getByLabelText("Line"), { target: { value: "4" } });
    fireEvent.change(within(form).getByLabelText("Name"), { target: { value: "Floor 4" } });
    await act(async () => fireEvent.submit(form));
    expect(store.getState().bench.lines.at(-1)).toMatchObject({ address: "1.4", name: "Floor 4" });
    await act(async () =>
      fireEvent.click(screen.getByRole("button", { name: "Add coupler 1.4.0 to line 1.4" })),
    );
    expect(store.getState().bench.devices.at(-1)).toMatchObject({
      type: "coupler",
      individualAddress: "1.4.0",
    });
    // A line that exists is refused with the reason.
    await act(async () => fireEvent.submit(form));
    expect(store.getState().notice).toMatchObject({ tone: "refusal", field: "line" });
  });
});

describe("CouplerPanel", () => {
  it("shows a stale stored table's blocked address, and regenerating it from the links fixes it", async () => {
    const store = mount("lc-floor-2");
    await act(async () =>
      fireEvent.click(screen.getByRole("button", { name: "Remove 4/0/1 from the filter table" })),
    );
    const table = screen.getByRole("table", { name: "Filter table of Floor 2 line coupler" });
    expect(within(table).getByRole("row", { name: /4\/0\/1/ }).textContent).toContain(
      "blocked, needed",
    );
    expect(screen.getByRole("status").textContent).toMatch(/1 address the links need is missing/);
    await act(async () =>
      fireEvent.click(screen.getByRole("button", { name: "Regenerate from the links" })),
    );
    const coupler = store.getState().bench.devices.find((d) => d.id === "lc-floor-2")!;
    expect(coupler.parameters.filterTable).toEqual(["4/0/1", "4/1/1"]);
    // The buffer per direction is checked against the coupler type's schema (1..1024).
    const buffer = screen.getByLabelText(/^Buffer per direction/);
    fireEvent.change(buffer, { target: { value: "0" } });
    await act(async () => fireEvent.blur(buffer));
    expect(store.getState().notice).toMatchObject({
      tone: "refusal",
      field: "parameters.queueCapacity",
    });
    fireEvent.change(buffer, { target: { value: "8" } });
    await act(async () => fireEvent.blur(buffer));
    expect(
      store.getState().bench.devices.find((d) => d.id === "lc-floor-2")!.parameters.queueCapacity,
    ).toBe(8);
    fireEvent.change(screen.getByLabelText("Group telegrams"), { target: { value: "block" } });
    expect(
      store.getState().bench.devices.find((d) => d.id === "lc-floor-2")!.parameters.groupTelegrams,
    ).toBe("block");
  });
});
