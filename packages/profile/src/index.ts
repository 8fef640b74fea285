export {
  EXACT,
  PROPERTY_KEYS,
  TORSION_DIMENSION,
  defaultOutputUnit,
  type Profile,
  type ProfileKey,
  type ProfileOptions,
  type TorsionValues,
} from './keys';
export { profileOf } from './profile';
export { computeDrawing, computeProfiles, type ComputeOptions, type FailedProfile } from './compute';
export { decodeDrawing } from './decode';
export { drawingFault, type DrawingFault } from './fault';
