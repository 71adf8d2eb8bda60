/** Registry of benchmark suites; each module contributes one function returning its cases. */
import type { BenchCase } from './harness';
import { timeCases } from './time';
import { spaceCases } from './space';
import { spaceMultigridCases } from './space-multigrid';
import { spacetimeCases } from './spacetime';
import { outputCases } from './output';
import { solutionFileCases } from './solution-file';
import { estimationCases } from './estimation';
import { exprCases } from './expr';
import { anisotropyCases } from './anisotropy';

export type Suite = (quick: boolean) => BenchCase[];

export const suites: Suite[] = [timeCases, spaceCases, spaceMultigridCases, spacetimeCases, outputCases, solutionFileCases, estimationCases, exprCases, anisotropyCases];
