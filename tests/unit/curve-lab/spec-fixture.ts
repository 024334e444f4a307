// Re-exports for the Curve Lab component tests.
export { defaultSpec, aircraftFor, type AirframeSnapshot, type DemoSpec } from "@/lib/curve-lab/demo-spec";
