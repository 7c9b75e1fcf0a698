import { cleanup, fireEvent, render, screen, waitFor } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { StartAndOpenButton } from "./start-and-open-button";

const push = vi.fn();
vi.mock("next/navigation", () => ({ useRouter: () => ({ push }) }));

afterEach(() => {
  cleanup();
  push.mockReset();
});

describe("StartAndOpenButton", () => {
  it("opens the page the server answers with", async () => {
    render(
      <StartAndOpenButton label="Start it" start={async () => "/somewhere"} errorText={String}>
        Start
      </StartAndOpenButton>,
    );
    fireEvent.click(screen.getByRole("button", { name: "Start it" }));
    await waitFor(() => expect(push).toHaveBeenCalledWith("/somewhere"));
  });

  it("shows a refusal under the button and can be pressed again", async () => {
    render(
      <StartAndOpenButton
        label="Start it"
        start={() => Promise.reject(new Error("limit reached"))}
        errorText={(cause) => (cause as Error).message}
      >
        Start
      </StartAndOpenButton>,
    );
    const button = screen.getByRole("button", { name: "Start it" });
    fireEvent.click(button);
    expect(await screen.findByRole("alert")).toHaveProperty("textContent", "limit reached");
    expect(button).toHaveProperty("disabled", false);
    expect(push).not.toHaveBeenCalled();
  });
});
