// Minimal type declarations for the two unit libraries the tests use as outside references
// (neither package ships its own types). Only the calls the tests make are declared.

declare module "convert-units" {
  interface Conversion {
    from(unit: string): { to(unit: string): number };
  }
  function convert(value?: number): Conversion;
  export default convert;
}

declare module "js-quantities" {
  interface Quantity {
    readonly scalar: number;
    to(unit: string): Quantity;
  }
  function Qty(definition: string): Quantity;
  export default Qty;
}
