import { act, cleanup, fireEvent, render, screen, waitFor } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import { deviceObjects } from "./model/device-objects";
import { testBench } from "./model/test-bench";
import { ParameterPanel } from "./parameter-panel";
import { EditorStoreProvider } from "./store/editor-context";
import { createEditorStore } from "./store/editor-store";

afterEach(cleanup);

function renderPanel(deviceId: string) {
  const store = createEditorStore(testBench());
  const view = () => {
    const device = store.getState().bench.devices.find((d) => d.id === deviceId)!;
    return (
      <EditorStoreProvider store={store}>
        <ParameterPanel device={device} />
      </EditorStoreProvider>
    );
  };
  const result = render(view());
  const rerender = () => result.rerender(view());
  return { store, rerender };
}

describe("ParameterPanel", () => {
  it("builds inputs from the type's zod schema with its defaults", () => {
    renderPanel("act-hall");
    expect((screen.getByLabelText(/^Channels/) as HTMLInputElement).value).toBe("1");
    expect((screen.getByLabelText("Status objects") as HTMLInputElement).checked).toBe(true);
    expect((screen.getByLabelText(/^Staircase \(s\)/) as HTMLInputElement).value).toBe("0");
  });

  it("applies a change at once: objects vanish and their links are dropped", async () => {
    const { store } = renderPanel("act-hall");
    await act(async () => {
      fireEvent.click(screen.getByLabelText("Status objects"));
    });
    await waitFor(() =>
      expect(store.getState().bench.devices[1]!.parameters.statusObjects).toBe(false),
    );
    expect(deviceObjects(store.getState().bench.devices[1]!).map((o) => o.number)).toEqual([0]);
    expect(
      store.getState().bench.links.some((l) => l.device === "act-hall" && l.object === 1),
    ).toBe(false);
  });

  it("shows the schema's message beside a value out of range and applies nothing", async () => {
    const { store } = renderPanel("act-hall");
    const before = store.getState().bench;
    const channels = screen.getByLabelText(/^Channels/);
    await act(async () => {
      fireEvent.change(channels, { target: { value: "12" } });
      fireEvent.blur(channels);
    });
    await waitFor(() => expect(screen.getByRole("alert").textContent).toMatch(/8/));
    expect(store.getState().bench).toBe(before);
  });

  it("adds a rocker to a push-button as a repeated fieldset, adding its group object", async () => {
    const { store, rerender } = renderPanel("pb-hall");
    await act(async () => {
      fireEvent.click(screen.getByRole("button", { name: "Add channel" }));
    });
    await waitFor(() => expect(deviceObjects(store.getState().bench.devices[0]!)).toHaveLength(2));
    rerender();
    expect(screen.getAllByLabelText("Function")).toHaveLength(2);
    // DPT spec §3: a scene rocker's object is 17.001.
    await act(async () => {
      fireEvent.change(screen.getAllByLabelText("Function")[1]!, { target: { value: "scene" } });
    });
    await waitFor(() =>
      expect(deviceObjects(store.getState().bench.devices[0]!)[1]!.dpt).toBe("17.001"),
    );
  });
});
