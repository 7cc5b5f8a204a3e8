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
//   profile-target    an uploaded target table as cubic splines (natural f, clamped z)
//   flow-resources    uploaded tables handed in: createFlowRun(spec, { initialProfile, targetProfile })
//   fork-flow-run     forkFlowRun(parent, spec): the parent's state on the fork's spec
//   mobius-dilations  γ_s, center X and its derivative L (operator), re-centring (Brent), F(s) = D(h∘γ_s)
//   dilation-profile  F(s) of a run's state (any checkpoint), its maximiser s* and the gap F(s*) − F(1)
//
// How the worker drives a run (all functions are pure computation, no clocks, no I/O):
//
//   const spec = parseRunSpec(json);              // ../spec: validates, fills defaults
//   const run = createFlowRun(spec);              // or deserializeCheckpoint(bytes)
//   for (;;) {
//     const res = advanceFlowRun(run, {
//       shouldStop: () => sliceOver(),            // checked before every step
//       cpuSecondsUsed: () => cpuSoFar(),         // caller's clock; engine never reads one
//       cpuBudgetSeconds: budget,                 // → outcome 'time-limit' (reason 'cpu-budget'), resumable
//     });
//     store(drainSamples(run));                   // §3 samples: every 25 steps and every 1.25× change of λ
//     save(serializeCheckpoint(run));             // resume is bit-identical, however the run is sliced
//     if (res.done) break;
//   }
//   const summary = summarizeFlowRun(run, cpuSeconds);   // the §5 object; blowup estimate for 'blowup'
//   const evidence = blowupEstimate(run);                 // full fit, uncertainties and notes
//   const { r, h } = flowProfile(run);                    // profile for plots (whole domain)
//   runDiagnostics(run);                                  // the current §3 sample
//   initialProfile(spec, 200);                            // cheap h₀ preview for the browser
//
// The Möbius-normalized flow (`flow: "normalized"`, sphere): createFlowRun re-centres h₀
// (X = 0, RecentreError if impossible); the drift σ·sin r·h_r enters every implicit stage
// with σ as one more unknown fixed by X_h(stage) = 0 (bordered tridiagonal system: two
// Thomas solves and a scalar Schur complement per Newton iteration, tr-bdf2-stepper);
// samples carry σ and its denominator; outcome `degenerate` when the denominator
// falls below ENGINE_SETTINGS.degenerateRatio of its scale.
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
export * from './profile-target';
export * from './flow-resources';
export * from './fork-flow-run';
export * from './mobius-dilations';
export * from './dilation-profile';
export * from './dilation-jump';
