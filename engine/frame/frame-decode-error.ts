/**
 * Why bytes were refused as a frame. Decoders return this instead of guessing:
 * a bad check octet, a length field that disagrees with the octets, a service or
 * frame type the engine does not model, or too few octets to read.
 */
export interface FrameDecodeError {
  readonly kind: "frame.checksum" | "frame.length" | "frame.service" | "frame.truncated";
  readonly message: string;
}

export function frameError(kind: FrameDecodeError["kind"], message: string): FrameDecodeError {
  return { kind, message };
}
