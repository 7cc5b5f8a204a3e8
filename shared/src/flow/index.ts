// The flow engine (numerics.md): pure TypeScript, no I/O, shared by the worker, the
// API and the browser. One file per concept:
//   target-geometry   the target N behind an interface (P = ρ², Q = f² and derivatives)
//   flow-model        domain, warping g, symmetry decision, end values
//   graded-grid       grid graded toward the poles, closed-form stretching
//   initial-data      h₀ of the spec, and a cheap preview profile
//   discrete-operator variational finite volumes: discrete energy, gradient, Hessian, tension
//   tridiagonal       Thomas algorithm
//   tr-bdf2-stepper   implicit TR-BDF2 step with Newton and a filtered error estimate
//   singularity-refinement / monotone-remap   refinement toward a forming singularity
//   flow-history / blowup-fit                 history and the blow-up fit (ml-matrix)
//   flow-run          create / advance / diagnostics / outcomes
//   flow-summary      the §5 result object
//   checkpoint-format versioned binary state, bit-identical resume
export * from './target-geometry';
export * from './flow-model';
export * from './graded-grid';
export * from './initial-data';
export * from './discrete-operator';
export * from './tridiagonal';
export * from './tr-bdf2-stepper';
export * from './monotone-remap';
export * from './singularity-refinement';
export * from './flow-history';
export * from './blowup-fit';
export * from './flow-run';
export * from './flow-summary';
export * from './checkpoint-format';
