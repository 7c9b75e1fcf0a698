import type { LoadedBench } from "../bench";
import type { Scheduler } from "../core/scheduler";
import type { FaultRegistry } from "./fault-registry";
import type { TraceEmitter } from "./trace-emitter";

/** Virtual delay of a message between unit-link members: 10 ms, our own figure for a wired HVAC link. */
export const UNIT_LINK_DELAY_US = 10_000;

/** A unit-link member as the medium sees it. */
export interface LinkMember {
  readonly id: string;
  /** The member's loaded device; its unit links may change with a parameter change. */
  readonly loaded: { readonly unitLinks: readonly string[] };
}

interface LinkMessage<M extends LinkMember> {
  readonly unitLink: string;
  readonly from: string;
  readonly to: M;
  readonly message: unknown;
}

/**
 * The unit-link medium: a message is delivered to every other member of the
 * link after `delayUs`, and only while the link is not broken (checked when
 * sent and again when delivered). Members are not told that a link broke: like
 * real units they notice by silence (their own timeouts).
 */
export class UnitLinkMedium<M extends LinkMember> {
  /** Scheduler tag of messages in flight. */
  readonly tag: number;

  constructor(
    private readonly scheduler: Scheduler,
    private readonly emitter: TraceEmitter,
    private readonly faults: FaultRegistry,
    private readonly bench: () => LoadedBench,
    private readonly member: (id: string) => M,
    private readonly delayUs: number,
    /** Hands a delivered message to the member's state machine. */
    private readonly handTo: (to: M, unitLink: string, from: string, message: unknown) => void,
  ) {
    if (!Number.isSafeInteger(delayUs) || delayUs < 0) {
      throw new RangeError(`unitLinkDelayUs ${delayUs} is not a non-negative integer`);
    }
    this.tag = scheduler.register((_, payload) => this.deliver(payload as LinkMessage<M>));
  }

  /** The fork's copy of a message in flight in another run, to the fork's member of the same id. */
  copyMessage(payload: unknown): LinkMessage<M> {
    const message = payload as LinkMessage<M>;
    return {
      unitLink: message.unitLink,
      from: message.from,
      to: this.member(message.to.id),
      message: message.message,
    };
  }

  /** Sends from a member to the other members of one of its links. */
  send(from: M, unitLink: string, message: unknown): void {
    if (!from.loaded.unitLinks.includes(unitLink)) {
      throw new Error(
        `device "${from.id}" sent on unit link "${unitLink}", which it is not a member of`,
      );
    }
    const link = this.bench().unitLinks.find((l) => l.id === unitLink)!;
    for (const memberId of link.members) {
      if (memberId === from.id) continue;
      if (this.faults.isBroken(unitLink)) {
        this.emitter.link("link.dropped", unitLink, from.id, memberId, message);
        continue;
      }
      const payload: LinkMessage<M> = {
        unitLink,
        from: from.id,
        to: this.member(memberId),
        message,
      };
      this.scheduler.schedule(this.scheduler.nowUs + this.delayUs, this.tag, 0, payload);
    }
  }

  private deliver({ unitLink, from, to, message }: LinkMessage<M>): void {
    if (this.faults.isBroken(unitLink)) {
      this.emitter.link("link.dropped", unitLink, from, to.id, message);
      return;
    }
    this.emitter.link("link.delivered", unitLink, from, to.id, message);
    this.handTo(to, unitLink, from, message);
  }
}
