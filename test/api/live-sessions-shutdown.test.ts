import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { STATUS } from "@/engine";
import { createWorld, destroyWorld, type World } from "./support/world";
import { rawKnxNetIpClient } from "@/test/harness/raw-knxnetip-client";

/**
 * Live sessions live in memory: when the server process is told to stop
 * (SIGTERM, as Next's start-up handler and container runtimes send it), every
 * tunnel ends the way the KNXnet/IP spec says, with a DISCONNECT_REQUEST to
 * the client's control endpoint (KNX Standard 03_08_02 Core, also ISO 22510).
 * A child process stands in for the server; the client is a bare UDP socket
 * on 127.0.0.1. Every wait is bounded and the child is always killed.
 */

let world: World;
let child: ChildProcess | undefined;
beforeAll(() => {
  world = createWorld();
});
afterAll(() => {
  child?.kill("SIGKILL");
  destroyWorld(world);
});

function published(server: ChildProcess): Promise<number> {
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error("the child did not publish")), 30_000);
    let output = "";
    server.stdout!.on("data", (chunk: Buffer) => {
      output += chunk.toString();
      const match = /published (\d+)/.exec(output);
      if (match) {
        clearTimeout(timer);
        resolve(Number(match[1]));
      }
    });
    server.on("exit", (code) => reject(new Error(`the child exited (${code})`)));
  });
}

describe("a stopping server process", () => {
  it("ends every tunnel with a DISCONNECT_REQUEST on SIGTERM", async () => {
    child = spawn(
      process.execPath,
      [
        "--import",
        "tsx",
        path.resolve("test/api/support/live-session-process.ts"),
        world.a.benchId,
        world.users.admin.userId,
        world.a.workspaceId,
      ],
      { env: { ...process.env }, stdio: ["ignore", "pipe", "inherit"] },
    );
    const port = await published(child);

    const client = await rawKnxNetIpClient(port);
    const receive = (service: string) => client.receive((f) => f.service === service, 5000);
    try {
      const connected = await client.connectTunnel(5000);
      expect(connected.status).toBe(STATUS.E_NO_ERROR);
      const channelId = connected.channelId;

      child.kill("SIGTERM");
      expect(await receive("DISCONNECT_REQUEST")).toMatchObject({
        service: "DISCONNECT_REQUEST",
        channelId,
      });
    } finally {
      client.close();
    }
  }, 40_000);
});
