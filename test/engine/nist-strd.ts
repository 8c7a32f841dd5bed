// NIST StRD nonlinear regression, "Misra1a" (lower difficulty) and "BoxBOD" (higher difficulty),
// both y = b1·(1 − exp(−b2·x)), shared by the tests that fit them
// (test/engine/least-squares.test.ts, test/engine/fit-certified.test.ts). Data, starting values
// and certified values typed from memory, then compared digit by digit with published copies of
// the NIST files (NIST's own pages are not reachable from here).
export const MISRA1A = {
  x: [77.6, 114.9, 141.1, 190.8, 239.9, 289.0, 332.8, 378.4, 434.8, 477.3, 536.8, 593.1, 689.1, 760.0],
  y: [10.07, 14.73, 17.94, 23.93, 29.61, 35.18, 40.02, 44.82, 50.76, 55.05, 61.01, 66.40, 75.47, 81.78],
  starts: [[500, 1e-4], [250, 5e-4]],
  certified: [2.3894212918e+02, 5.5015643181e-04],
  standardErrors: [2.7070075241e+00, 7.2668688436e-06],
  rss: 1.2455138894e-01,
  residualSD: 1.0187876330e-01,
  dof: 12,
};
export const BOXBOD = {
  x: [1, 2, 3, 5, 7, 10],
  y: [109, 149, 149, 191, 213, 224],
  starts: [[1, 1], [100, 0.75]],
  certified: [2.1380940889e+02, 5.4723748542e-01],
  standardErrors: [1.2354515176e+01, 1.0455993237e-01],
  rss: 1.1680088766e+03,
  residualSD: 1.7088072423e+01,
  dof: 4,
};
