export { EXACT, PROPERTY_KEYS, defaultOutputUnit, profileOf, type Profile } from './profile';
export { computeDrawing, type ComputeOptions } from './compute';
export { decodeDrawing } from './decode';
export { drawingFault, type DrawingFault } from './fault';
