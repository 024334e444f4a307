// Minimal types for js-quantities 1.8 (the package ships none); used only by the cross-check tests.
declare module "js-quantities" {
  class Qty {
    constructor(value: number, units?: string);
    constructor(definition: string);
    readonly scalar: number;
    to(units: string): Qty;
    units(): string;
  }
  export default Qty;
}
