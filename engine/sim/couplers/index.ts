export { CouplerNetwork } from "./coupler-network";
export { CouplerPort, type CouplerCounts } from "./coupler-port";
