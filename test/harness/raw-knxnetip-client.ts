import dgram from "node:dgram";
import {
  decodeKnxNetIpFrame,
  encodeKnxNetIpFrame,
  ROUTE_BACK_HPAI,
  tunnelCri,
  type KnxNetIpFrame,
} from "@/engine";

/**
 * A bare KNXnet/IP client on 127.0.0.1 built on the engine's frame code, for
 * tests that send frames no library client would; every wait is bounded.
 */
export async function rawKnxNetIpClient(port: number) {
  const socket = dgram.createSocket("udp4");
  await new Promise<void>((resolve) => socket.bind(0, "127.0.0.1", () => resolve()));
  const inbox: KnxNetIpFrame[] = [];
  socket.on("message", (message) => {
    const decoded = decodeKnxNetIpFrame(new Uint8Array(message));
    if (decoded.ok) inbox.push(decoded.value);
  });
  const send = (frame: KnxNetIpFrame) => {
    socket.send(encodeKnxNetIpFrame(frame), port, "127.0.0.1");
  };
  /** The first received frame passing `accept` (consumed), or undefined after `timeoutMs` of real time. */
  const receive = async (accept: (frame: KnxNetIpFrame) => boolean, timeoutMs = 2000) => {
    const deadline = Date.now() + timeoutMs;
    for (;;) {
      const index = inbox.findIndex(accept);
      if (index >= 0) return inbox.splice(index, 1)[0];
      if (Date.now() > deadline) return undefined;
      await new Promise((resolve) => setTimeout(resolve, 5));
    }
  };
  return {
    send,
    receive,
    /**
     * Asks for a tunnel (CONNECT_REQUEST with route-back endpoints, engine/knxnetip) and
     * returns the server's CONNECT_RESPONSE; throws when none comes within `timeoutMs`.
     */
    async connectTunnel(timeoutMs = 2000) {
      send({
        service: "CONNECT_REQUEST",
        controlEndpoint: ROUTE_BACK_HPAI,
        dataEndpoint: ROUTE_BACK_HPAI,
        cri: tunnelCri(),
      });
      const connected = await receive((f) => f.service === "CONNECT_RESPONSE", timeoutMs);
      if (connected?.service !== "CONNECT_RESPONSE") throw new Error("no CONNECT_RESPONSE");
      return connected;
    },
    close: () => socket.close(),
  };
}
