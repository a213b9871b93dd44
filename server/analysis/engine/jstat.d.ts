// Local type declaration for the parts of jstat the analysis engine uses
// (the package ships no types).
declare module 'jstat' {
  interface JStatStatic {
    centralF: {
      cdf(x: number, df1: number, df2: number): number;
      inv(p: number, df1: number, df2: number): number;
    };
    studentt: {
      cdf(x: number, dof: number): number;
      pdf(x: number, dof: number): number;
      inv(p: number, dof: number): number;
    };
    tukey: {
      cdf(q: number, nmeans: number, dof: number): number;
      inv(p: number, nmeans: number, dof: number): number;
    };
    /** Regularised incomplete beta function I_x(a, b). */
    ibeta(x: number, a: number, b: number): number;
  }
  const jStat: JStatStatic;
  export default jStat;
}
