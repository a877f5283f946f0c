// The part of jstat (npm "jstat", MIT) that we use; the package ships no type declarations.
declare module 'jstat' {
  export const jStat: {
    studentt: {
      /** Quantile: x with P(T ≤ x) = p for Student's t with `dof` degrees of freedom. */
      inv(p: number, dof: number): number;
      /** P(T ≤ x). */
      cdf(x: number, dof: number): number;
    };
  };
}
