// The pure domain computations shared by the server and the client (issue 3).
export * from "./units.js";
export * from "./window-status.js";
export * from "./senml.js";
export * from "./sensor-readings.js";
export * from "./psychrometrics.js";
export * from "./window-evaluation.js";
export * from "./time-in-window.js";
export * from "./batch.js";
