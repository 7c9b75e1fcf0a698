/**
 * The message protocol between the live console page and the simulation
 * worker. It is defined by the engine's live session (engine/sim/live), which
 * runs the same in the worker and in a server process; the page reads it here.
 */
export * from "@/engine/sim/live/live-protocol";
