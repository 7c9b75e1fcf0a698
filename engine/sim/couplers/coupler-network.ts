import type { LoadedBench } from "../../bench";
import type { Telegram, Tp1Sender } from "../../bus";
import type { SequentialIds } from "../../core/ids";
import { runArray } from "../../core/run-objects";
import type { Trace } from "../../core/trace";
import { benchCouplers, loadedAddressUses } from "../../topology/bench-topology";
import { isWithin } from "../../topology/line-address";
import { NO_ACK_OCTET } from "../../bus";
import type { LineRuntime, ObjectOwner } from "../group-objects";
import {
  CouplerPort,
  emptyCouplerCounts,
  type CouplerCounts,
  type PortContext,
} from "./coupler-port";

/**
 * The couplers of a run: two ports per coupler (engine/sim/couplers/coupler-port.ts),
 * hung on their lines' `couplers` lists so the group-object layer asks them
 * at the end of every frame. Lines without a coupler between them stay
 * separate media, as before couplers existed.
 *
 * Why a telegram reaches each listener once: devices sit on one line each, a
 * port never passes on a frame its own side sent, and couplers join lines as
 * a tree (a.l to a.0, a.0 to 0.0; the loader admits no other coupler
 * addresses, and one address is one coupler), so a telegram reaches each line
 * by one path at most. Repetitions are recognised per line by telegram id, as
 * devices do.
 */
export class CouplerNetwork {
  private ports: CouplerPort[] = runArray<CouplerPort>();
  private readonly portBySender = new Map<Tp1Sender, CouplerPort>();
  private readonly countsByCoupler = new Map<string, CouplerCounts>();

  constructor(
    bench: LoadedBench,
    private readonly lines: ReadonlyMap<string, LineRuntime>,
    private readonly trace: Trace,
    private readonly clock: { readonly nowUs: number },
    private readonly telegramIds: SequentialIds,
    /** The coupler device's acknowledgement under an injected bus fault (ACK when none). */
    private readonly busAnswer: (couplerId: string) => number,
    /** Every running device: who answers an individually addressed frame on its line. */
    devices: readonly ObjectOwner[] = [],
  ) {
    for (const coupler of benchCouplers(bench)) {
      const [above, below] = listenersBySide(bench, coupler.lowerLineAddress);
      const counts = emptyCouplerCounts();
      this.countsByCoupler.set(coupler.id, counts);
      const context = new CouplerContext(trace, clock, telegramIds, busAnswer, coupler.id, counts);
      const lower = lines.get(coupler.lowerLine)!;
      const upper = lines.get(coupler.upperLine)!;
      const up = new CouplerPort(coupler, above, "up", lower.id, lower.line, context);
      const down = new CouplerPort(coupler, below, "down", upper.id, upper.line, context);
      up.far = down;
      down.far = up;
      for (const port of [up, down]) {
        this.ports.push(port);
        this.portBySender.set(port.sender, port);
      }
      lower.couplers = appended(lower.couplers, up);
      upper.couplers = appended(upper.couplers, down);
    }
    this.wireIndividual(devices);
  }

  /**
   * Individually addressed frames: the couplers on the line hear them (routing
   * by address), and the device with the destination address acknowledges
   * (as it would on the bus; the engine models no services for them, so
   * nothing is delivered).
   */
  private wireIndividual(devices: readonly ObjectOwner[]): void {
    const byLine = new Map<LineRuntime, Map<number, ObjectOwner>>();
    for (const device of devices) {
      const address = device.loaded.individualAddress;
      if (device.line === undefined || address === undefined) continue;
      let map = byLine.get(device.line);
      if (map === undefined) byLine.set(device.line, (map = new Map()));
      map.set(address, device);
    }
    for (const line of this.lines.values()) {
      const addressed = byLine.get(line) ?? new Map<number, ObjectOwner>();
      line.receiveIndividual = (telegram, repeated) => {
        let answer = NO_ACK_OCTET;
        const couplers = line.couplers ?? [];
        for (let i = 0; i < couplers.length; i++)
          answer &= couplers[i]!.receive(telegram, repeated);
        const device = addressed.get(telegram.frame.destination);
        if (device !== undefined && device.sender !== telegram.sender) answer &= device.busAnswer;
        return answer;
      };
    }
  }

  /** True when the bench has couplers. */
  get any(): boolean {
    return this.ports.length > 0;
  }

  /** The bench changed (a parameter download): couplers take their new settings and tables. */
  refresh(bench: LoadedBench): void {
    const byId = new Map(benchCouplers(bench).map((c) => [c.id, c]));
    for (const port of this.ports) {
      port.coupler = byId.get(port.coupler.id) ?? port.coupler;
      const [above, below] = listenersBySide(bench, port.coupler.lowerLineAddress);
      port.farListens = port.direction === "up" ? above : below;
    }
  }

  /** A telegram was given up on its line; a coupler that sent it traces the drop. */
  lost(telegram: Telegram): void {
    this.portBySender.get(telegram.sender)?.lost(telegram);
  }

  /** Forwarded and dropped telegrams per coupler id since the start of the run. */
  counts(): ReadonlyMap<string, Readonly<CouplerCounts>> {
    return this.countsByCoupler;
  }

  /** The senders of every port, for a forked run to copy queues into. */
  senders(): readonly Tp1Sender[] {
    return this.ports.map((p) => p.sender);
  }

  /** This run's port matching `original`'s port, or undefined when `taker` is not a port. */
  portLike(original: CouplerNetwork, taker: unknown): CouplerPort | undefined {
    const index = original.ports.indexOf(taker as CouplerPort);
    return index < 0 ? undefined : this.ports[index];
  }

  /** This run's sender matching one of `original`'s port senders, or undefined. */
  senderLike(original: CouplerNetwork, sender: Tp1Sender): Tp1Sender | undefined {
    const port = original.portBySender.get(sender);
    return port === undefined ? undefined : this.ports[original.ports.indexOf(port)]!.sender;
  }

  /**
   * Takes over `original`'s buffers and counts, for a forked run. Call after the
   * telegram copies exist is not needed: `copyTelegram` makes them on demand.
   */
  copyFrom(original: CouplerNetwork, copyTelegram: (telegram: Telegram) => Telegram): void {
    original.ports.forEach((port, i) => {
      const mine = this.ports[i]!;
      mine.sender.copyFrom(port.sender, (t) => {
        const copy = copyTelegram(t);
        mine.copyOrigin(t, copy);
        return copy;
      });
    });
    for (const [id, counts] of original.countsByCoupler) {
      const mine = this.countsByCoupler.get(id)!;
      mine.forwarded = counts.forwarded;
      Object.assign(mine.dropped, counts.dropped);
    }
  }
}

/** Group addresses with a listener above and below the coupler of `lowerLine`. */
function listenersBySide(
  bench: LoadedBench,
  lowerLine: number,
): [ReadonlySet<number>, ReadonlySet<number>] {
  const above = new Set<number>();
  const below = new Set<number>();
  for (const [groupAddress, use] of loadedAddressUses(bench)) {
    for (const line of use.listeners) {
      if (isWithin(line, lowerLine)) below.add(groupAddress);
      else above.add(groupAddress);
    }
  }
  return [above, below];
}

/** What both ports of one coupler share of the run: a class, not a literal (engine/core/run-objects.ts). */
class CouplerContext implements PortContext {
  constructor(
    readonly trace: Trace,
    readonly clock: { readonly nowUs: number },
    readonly telegramIds: SequentialIds,
    private readonly answers: (couplerId: string) => number,
    private readonly couplerId: string,
    readonly counts: CouplerCounts,
  ) {}

  busAnswer(): number {
    return this.answers(this.couplerId);
  }
}

/** `list` with `item` added, as a new array for the run to keep (engine/core/run-objects.ts). */
function appended<T>(list: readonly T[] | undefined, item: T): T[] {
  const next = runArray<T>();
  if (list !== undefined) for (const kept of list) next.push(kept);
  next.push(item);
  return next;
}
