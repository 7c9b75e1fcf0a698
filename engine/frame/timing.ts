/**
 * TP1 bus timing, so the bus can be modelled to the bit. All figures are in bit
 * times or integer microseconds of virtual time.
 *
 * Sources (knx-reference.md, "TP1 timing"): Basic course, chapter "KNX TP Telegram";
 * TP1 conformance §10.1.2.
 */

/** TP1 transmission rate: 9600 bit/s, so one bit time is 1e6/9600 ≈ 104.17 µs. */
export const BITS_PER_SECOND = 9600;

/**
 * A character is 11 bits (start, 8 data, even parity, stop) followed by a 2-bit
 * pause: 13 bit times per frame octet.
 */
export const CHARACTER_BIT_TIMES = 13;

/** The line must be idle 50 bit times before a telegram may start. */
export const IDLE_BEFORE_FRAME_BIT_TIMES = 50;

/** The acknowledgement character starts 15 bit times after the frame ends. */
export const ACK_GAP_BIT_TIMES = 15;

/** The acknowledgement is one 11-bit character (no trailing pause counted). */
export const ACK_CHARACTER_BIT_TIMES = 11;

/** After BUSY the sender waits at least 150 bit times before repeating. */
export const BUSY_RETRY_WAIT_BIT_TIMES = 150;

/** A sender repeats a frame at most 3 times after NAK, BUSY or no acknowledgement. */
export const MAX_REPETITIONS = 3;

/** Acknowledgement characters: ACK 0xCC, NAK 0x0C, BUSY 0xC0. */
export const ACK_OCTET = 0xcc;
export const NAK_OCTET = 0x0c;
export const BUSY_OCTET = 0xc0;

/**
 * Converts bit times to integer microseconds: Math.round(bits · 1e6 / 9600).
 * Rounding once per conversion (not per bit) keeps long spans exact to 1 µs.
 */
export function bitTimesToUs(bits: number): number {
  return Math.round((bits * 1_000_000) / BITS_PER_SECOND);
}

/** Bit times a frame of `octets` characters occupies on the line: octets · 13. */
export function frameBitTimes(octets: number): number {
  return octets * CHARACTER_BIT_TIMES;
}

/** Duration of a frame of `octets` characters in integer microseconds. */
export function frameDurationUs(octets: number): number {
  return bitTimesToUs(frameBitTimes(octets));
}

/**
 * Bit times one acknowledged telegram holds the line: idle 50 + 13 per octet +
 * gap 15 + acknowledgement 11. A 9-octet switching telegram takes 193 (Basic course).
 */
export function telegramOccupancyBitTimes(octets: number): number {
  return (
    IDLE_BEFORE_FRAME_BIT_TIMES +
    frameBitTimes(octets) +
    ACK_GAP_BIT_TIMES +
    ACK_CHARACTER_BIT_TIMES
  );
}

/** `telegramOccupancyBitTimes` in integer microseconds (193 bit times -> 20104 µs). */
export function telegramOccupancyUs(octets: number): number {
  return bitTimesToUs(telegramOccupancyBitTimes(octets));
}
