export type {
  ArcSegment,
  EllipseSegment,
  LineSegment,
  Loop,
  Part,
  Point,
  Region,
  Segment,
  SplineSegment,
  WeightedPoint,
} from './types';
export { GeometryError, type GeometryErrorCode } from './errors';
export {
  TAU,
  arc,
  arcFromCentre,
  arcContainsAngle,
  ellipse,
  evalSegment,
  paramRange,
  pointOnEllipse,
  smoothBreaks,
  applyToPoint,
  endPoint,
  line,
  pointOnArc,
  reverseSegment,
  segmentLength,
  startPoint,
  transformSegment,
  type Affine,
} from './segment';
export { loopMoments, regionMoments, type RawMoments } from './moments';
export { loopBox, regionBox, regionRange, segmentRange, type Box } from './extent';
export {
  allLoops,
  checkLoop,
  makeRegion,
  mirrorX,
  perimeter,
  reverseLoop,
  rotation,
  scaling,
  segmentCount,
  signedLoopArea,
  transformRegion,
  translation,
} from './region';
export { plasticAboutHorizontal, type PlasticAxis } from './plastic';
export { sectionProperties, type PropertyKey, type SectionProperties } from './properties';
export {
  LENGTH_UNITS,
  OUTPUT_UNITS,
  PROPERTY_DIMENSION,
  convertProperties,
  isLengthUnit,
  isOutputUnit,
  lengthFactor,
  propertyUnit,
  type LengthUnit,
  type OutputUnit,
} from './units';
export { nestLoops, pointInLoop } from './nest';
export { findCrossing, findCrossings, type Crossing } from './crossings';
export { flattenSegment } from './flatten';
export { isRational, splineDomain } from './spline';
export { symmetries, type Symmetry } from './symmetry';
