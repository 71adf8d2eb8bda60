/** Help texts of the command line. */
import { PROBLEM_DEFAULTS } from '../problem-file/index';
import { SENSOR_TIMES_DEFAULT } from '../problem-file/schema';

export const CAUTION = `CAUTION: chronomesh computes approximate solutions of a mathematical model. Results
can be wrong through modelling assumptions, input mistakes, discretisation and
solver error, or software faults. Do not rely on them alone for decisions about
thermal safety, medical heating (e.g. hyperthermia or tissue exposure), fire
protection or other safety matters: follow the applicable codes and standards and
have results checked by a licensed engineer using independent methods. The error
estimate is a global measure over space and time, not a bound on a point value or
a peak temperature.`;

export const MAIN_HELP = `usage: chronomesh <command> [options]

Space-time solver for heat and diffusion problems (wavelets in time, finite
elements in space, adaptive sparse index sets).

commands:
  solve PROBLEM.json   solve the problem described by a problem file
  bench [SUITE…]       measure operator costs (ns per unit)
  demo                 run the built-in scenarios and the shipped examples

options:
  --version            print the version
  --help               this text; \`chronomesh <command> --help\` for a command

${CAUTION}`;

export const SOLVE_HELP = `usage: chronomesh solve PROBLEM.json [--json] [--out DIR] [--checkpoint FILE]
                       [--resume FILE] [--quiet] [--debug]

Solves ∂t u − ∇·(κ∇u) + c u = f on (0, T) × Ω with u = 0 on the boundary
except its insulated part (zero flux) and its boundary parts, u(0) = u0, as
described by PROBLEM.json.

  --json        print exactly one JSON document on stdout:
                {"steps":[{"dofs","estimate","relativeEstimate","iterations",
                 "riseChecks","seconds"}…],
                 "probes":[{"t","x","y","value","previous"}…], "rate": r,
                 "stopReason", "tolerance", "toleranceReached", "forecast",
                 "heldDataError",
                 "exactErrors": {"energyL2","gradientL2","valueL2",
                 "ratioToEstimate","ratioRange","rate","splitCheck"} or null,
                 "sensors": {"times","points","values"} or null}; steps carry
                 "trueError" when the file has an exact solution
                (rate: least-squares slope of −log E against log N over the
                second half of the steps; forecast: {"rate","unknowns",
                "seconds"} where E would reach a missed tolerance at the
                rate of the steps since N was an eighth of its last value,
                or null; tolerance: the E asked for, tolerance +
                relativeTolerance × ‖u‖ of the last step; relativeEstimate: E divided by the size of the
                solution in the norm E measures, the "% of ‖u‖" of the
                progress lines, or null; y is null in 1D)
  --out DIR     write history (JSON, CSV), probe table (CSV), slices (VTK XML
                .vtu + .pvd), pictures (SVG) and the state at T (end-state.json,
                to continue from) into DIR (checked writable first)
  --checkpoint FILE
                adaptive strategy: after every step, save the run to FILE
                (replaced atomically, so it always holds a complete step)
  --resume FILE continue the adaptive run saved in FILE (same problem file;
                the step budget counts the saved steps too)
  --quiet       no progress lines on stderr
  --debug       print stack traces of errors

problem file fields (JSON object):
  domain      {"shape":"interval","from":a,"to":b,"cells":n}
              {"shape":"rectangle","from":[x0,y0],"to":[x1,y1],"cells":[nx,ny]}
              {"shape":"lshape"}   (−1,1)² minus [0,1]×[−1,0]; optional "cells":n
              {"shape":"mesh","points":[[x,y],…],"triangles":[[i,j,k],…]}
  horizon     final time T > 0 (required)
  start       the time the run starts at, 0 ≤ start < horizon (default 0):
              probes, slices and every expression in t use absolute time;
              a run that continues another from its end state sets start
              to that run's horizon, so time-dependent data carry on
  diffusion   κ(x, y) > 0, default "${PROBLEM_DEFAULTS.diffusion}" (taken at initial-element centroids);
              2D: or a tensor {"xx":…,"xy":…,"yy":…} (expressions; xy default 0,
              xx·yy − xy² > 0) for anisotropic diffusion ∇·(K∇u); flux and
              convection parts then prescribe the conormal flux n·K∇u
  reaction    c(x, y) ≥ 0, default "${PROBLEM_DEFAULTS.reaction}" (taken at initial-element centroids)
              (a warning names the element where either varies most inside,
              if by more than 1 %: give more cells there)
  source      f(t, x, y), default "${PROBLEM_DEFAULTS.source}"
  curveSources list of sources concentrated on a polyline (2D, heat per unit
              length and time: a heating cable, a pipe seen from above) or at a
              point (1D, heat per unit time): {"curve":[[x,y],…] (1D: [[x]]),
              "time":g(t) (default "1"), "density":ρ(x,y) (default "1")}; the
              load is ∫∫ g ρ v along the curve. The curve must lie inside the
              domain. No point sources in 2D (the temperature there would be
              infinite): spread one over a small disc with "source"
  initial     u0(x, y), default "${PROBLEM_DEFAULTS.initial}"; or {"state":"FILE"} to start from a
              state file (path relative to this file), such as the
              end-state.json of an earlier run's --out: values at the points of
              a triangulation, {"points":[[x,y],…],"cells":[[i,j,k],…],
              "values":[…]} (1D: points x, cells [i,j]), interpolated linearly;
              its mesh must cover the domain
  insulated   predicate on boundary-edge midpoints (nonzero = insulated),
              e.g. "y > 0.999"; the rest of the boundary has u = 0
  boundary    list of parts, applied in order after "insulated"; "where" is an
              expression in x, y, nonzero on the boundary edges to select
              (evaluated at edge midpoints; a "where" or "insulated" that
              selects no edge is refused, since its edges would silently keep
              the default):
              {"kind":"value","where":…,"value":g(t,x,y)}        u = g
               (g is interpolated linearly between initial-mesh vertices
               along the part: exact for g affine along each initial edge,
               e.g. a history g(t); otherwise the run reports the error left,
               "heldDataError" (warning when ≥ E/2), which refinement does not
               reduce; a tolerance below it is refused: give more cells there;
               g must be continuous in time: a jump is refused, split the run
               at it and start the second file from the first's end-state.json)
              {"kind":"flux","where":…,"flux":q(t,x,y)}          κ∂u/∂n = q (q > 0 heats)
              {"kind":"convection","where":…,"transferCoefficient":h(x,y),
               "ambient":u∞(t,x,y)}                               κ∂u/∂n = h(u∞ − u)
               (h is taken at the midpoint of each initial edge; a warning
               names the edge where it varies most along, if by more than 1 %)
              Narrow fluxes and pulses in time (of f, q, u∞ or g) are found by
              sampling before the first step and resolved in the loads and the
              first adaptive set; features shorter than about T/4000 or
              narrower than about diam(Ω)/400 can be missed. A body insulated
              all round is refused: pose v = e^(−λt)·u with reaction λ and the
              data times e^(−λt), then multiply by e^(λt) (docs/method.md §1.1).
  strategy    "adaptive" (default), "sparse" or "full" (grids of growing level)
  tolerance   stop when the estimator E ≤ tolerance (default ${PROBLEM_DEFAULTS.tolerance}); E is an
              estimate of the error, not a bound: against exact solutions the
              error in the energy norm (∫∫ κ|∇e|² + c e²)^1/2 was 0.7–2.3 times
              E, so ask for a few times less than the error you can accept
  relativeTolerance  in [0, 1), default 0: adds this fraction of the size of
              the solution (in the norm E measures, the "% of ‖u‖" printed with
              every step) to tolerance: 0.05 stops at E ≤ 5 % of ‖u‖, whatever
              the units of u; where values are held, of the part of u beyond them
  maxDofs     unknown budget (default ${PROBLEM_DEFAULTS.maxDofs})
  maxSeconds  wall-time budget (default ${PROBLEM_DEFAULTS.maxSeconds})
  maxSteps    step budget (default ${PROBLEM_DEFAULTS.maxSteps})
              (adaptive runs also stop on "memory", the next step's estimated
              memory, and on "resolution": the next set would need time scales
              below T·2^-50, where the estimator is unreliable; initial data that
              violate the boundary values with T ≫ L²/κ get there early: solve
              over a few diffusion times L²/κ and continue from its end state;
              and on "rounding": E ≤ 1e-10 × ‖u‖, the discrete solution solves
              the problem to working precision, as when a known solution lies
              in the discrete space)
  bulk        Dörfler parameter θ in (0, 1) (default 0.5 in 1D, 0.7 in 2D)
  acceptFlatElements
              true to run the adaptive strategy on a mesh whose bulk is too
              flat for its estimator (default false: such a mesh is refused
              before any work, naming the flattest element; bisection keeps their
              descendants as flat, where E was measured 3-12 times below the
              true error and PCG stalls; better: more vertices along the long
              sides, docs/adaptivity.md §2.6)
  probes      list of [t, x] or [t, x, y]
  sensors     {"points": [[x, y], …], "times": n or [t, …]}: sensor histories,
              u at fixed points read at n evenly spaced times over [start,
              horizon] (default ${SENSOR_TIMES_DEFAULT}) or at the listed times; printed at the
              last time, all in sensors.csv with --out and "sensors" with --json
  slices      list of times to export with --out
  exact       a known solution u(t, x, y) to verify against (for instance a
              manufactured one, with the source computed from it): checked
              before the run against the equation (κ and c constant per initial
              element, as solved), the initial state and every boundary
              condition at sample points (exact derivatives; a mismatch is an
              input error naming the condition and the point); then every
              step reports its true error in the energy norm
              (∫∫ κ|∇e|² + c e² + ∫∫ h e² on convection parts)^1/2, the
              norm E measures ("trueError"; the L2(0,T;H1) norm when κ = 1,
              c = 0 and nothing convects), and the run the band of
              true error / E, the true error's observed rate and the last
              L2(0,T;H1) and L2(0,T;L2) errors. Held values are interpolated
              linearly along initial edges: pick a solution whose boundary
              values are affine there, or the error stalls at about
              "heldDataError"
  title, description   free text
expressions: numbers, t x y, pi e, + − * / ^ ( ), < <= > >= == !=, && || !,
  a ? b : c, sin cos tan exp log sqrt abs min max atan2 pow.

exit status: 0 done, 3 done but the tolerance was not reached (the results are
  written; a warning on stderr gives the estimator and a forecast of the
  unknowns and time the tolerance would take; --json has "toleranceReached"),
  2 bad input (one line on stderr), 1 other failure.

${CAUTION}`;

export const BENCH_HELP = `usage: chronomesh bench [SUITE…] [--json] [--quick] [--out FILE]

Times one application of each operator and prints ns per unit (median).
SUITE selects rows by component-name prefix, e.g. \`time.\`, \`space.\`,
\`spacetime.\`, \`expr.\`. Timings depend on the machine and its load.
  --json        print one JSON document {"rows":[…]} on stdout
  --quick       smaller sizes (smoke test)
  --out FILE    also write the JSON document to FILE`;

export const DEMO_HELP = `usage: chronomesh demo [--quick] [--out DIR]

Runs the built-in example scenarios (a cooling rod, an L-shaped bracket
with a hot spot, a convergence study, adaptive runs, operator costs) and
then the shipped problem files of examples/ through \`chronomesh solve\`,
prints their results and writes time slices (VTK XML .vtu + .pvd, SVG
pictures), probe tables (CSV) and histories (JSON + SVG plots) into DIR.
  --quick     smaller problems
  --out DIR   output folder (default: out)

${CAUTION}`;
