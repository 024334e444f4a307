// Every model, initialised at module top level so each bundle that imports this sees them ready.
export * from "./school";
export * from "./person";
export * from "./course";
export * from "./cohort";
export * from "./airframe";
export * from "./demo";
export * from "./briefing";
export * from "./assignment";
export * from "./session";
export * from "./ground-log";
