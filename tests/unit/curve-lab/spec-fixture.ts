// Re-exports for the Curve Lab component tests.
export { defaultSpec, aircraftFor, type AirframeSnapshot, type DemoSpec } from "@/components/charts/demo-spec";
