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

/**
 * One message sent, shared by its deliveries: each queued delivery is this
 * (payload) and the recipient's place in `members` (arg), so a message to a
 * link of three allocates one record, not one per recipient. Holds ids, not
 * members, so a fork's queue can share it.
 */
interface LinkMessage {
  readonly unitLink: string;
  readonly from: string;
  /** The link's members when it was sent (the bench's array). */
  readonly members: readonly string[];
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
    this.tag = scheduler.register((index, payload) => this.deliver(payload as LinkMessage, index));
  }

  /** The fork's copy of a message in flight in another run: shared, as it names members by id. */
  copyMessage(payload: unknown): LinkMessage {
    return payload as LinkMessage;
  }

  /** Sends from a member to the other members of one of its links. */
  send(from: M, unitLink: string, message: unknown): void {
    if (!from.loaded.unitLinks.includes(unitLink)) {
      throw new Error(
        `device "${from.id}" sent on unit link "${unitLink}", which it is not a member of`,
      );
    }
    const members = this.bench().unitLinks.find((l) => l.id === unitLink)!.members;
    let sent: LinkMessage | undefined;
    for (let i = 0; i < members.length; i++) {
      const memberId = members[i]!;
      if (memberId === from.id) continue;
      if (this.faults.isBroken(unitLink)) {
        this.emitter.link("link.dropped", unitLink, from.id, memberId, message);
        continue;
      }
      sent ??= { unitLink, from: from.id, members, message };
      this.scheduler.schedule(this.scheduler.nowUs + this.delayUs, this.tag, i, sent);
    }
  }

  private deliver({ unitLink, from, members, message }: LinkMessage, index: number): void {
    const to = this.member(members[index]!);
    if (this.faults.isBroken(unitLink)) {
      this.emitter.link("link.dropped", unitLink, from, to.id, message);
      return;
    }
    this.emitter.link("link.delivered", unitLink, from, to.id, message);
    this.handTo(to, unitLink, from, message);
  }
}
