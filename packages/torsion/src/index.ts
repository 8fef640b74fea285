export { torsionProperties, meshRegion, baseMesh, meshParams, type TorsionOptions, type TorsionProperties } from './torsion';
export { meshSvg, type MeshSvgOptions } from './svg';
export { generateMesh, type MeshParams, type TriMesh } from './mesh';
export { quadratic, refine, edgesOf, type QuadMesh, type Level, type Edges } from './levels';
export { solveWarping, type LevelResult } from './warping';
export { frameOf, curvesOf, type Frame, type Curve } from './frame';
export {
  applyFactor,
  conjugateGradient,
  entry,
  incompleteCholesky,
  multiply,
  patternOf,
  permute,
  reverseCuthillMcKee,
  type Csr,
  type Factor,
  type SolveReport,
} from './sparse';
export { TorsionError, type TorsionErrorCode } from './errors';
export { EnvelopeCholesky, Multigrid, interpolate, linearStiffness, linearTransfer, quadraticTransfer } from './multigrid';
export { assemble, finish, solveAssembled, type Assembly } from './warping';
