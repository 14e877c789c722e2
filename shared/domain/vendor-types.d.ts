// Minimal typings for untyped npm reference libraries used only in tests to cross-check
// the domain maths. Only the members the tests call are declared.

declare module 'jstat' {
  interface JStatBeta {
    pdf(x: number, alpha: number, beta: number): number;
    cdf(x: number, alpha: number, beta: number): number;
    inv(p: number, alpha: number, beta: number): number;
    mean(alpha: number, beta: number): number;
  }
  interface JStatNormal {
    inv(p: number, mean: number, std: number): number;
    cdf(x: number, mean: number, std: number): number;
  }
  interface JStatBinomial {
    pdf(k: number, n: number, p: number): number;
    cdf(k: number, n: number, p: number): number;
  }
  interface JStatStatic {
    beta: JStatBeta;
    normal: JStatNormal;
    binomial: JStatBinomial;
    betafn(x: number, y: number): number;
    betaln(x: number, y: number): number;
    gammaln(x: number): number;
    combination(n: number, m: number): number;
    ibeta(x: number, a: number, b: number): number;
    ibetainv(p: number, a: number, b: number): number;
  }
  const jStat: JStatStatic;
  export default jStat;
}

declare module 'js-quantities' {
  interface Quantity {
    readonly scalar: number;
    to(units: string): Quantity;
    toString(): string;
  }
  function Qty(value: string | number, units?: string): Quantity;
  export default Qty;
}
