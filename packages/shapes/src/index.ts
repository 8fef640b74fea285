export { filletedPolygon, polygon, type Corner } from './fillet';
export { circle, circleLoop, polygonRegion, rectangle, rectangleLoop, tube } from './basic';
export { angle, channel, hollowRectangle, iSection } from './sections';
export { lippedChannel, lippedChannelCentreline } from './lipped-channel';
export { tee } from './tee';
export { tSlotProfile, type TSlotDims } from './t-slot';
export { screwPortTube, type ScrewPortTubeDims } from './screw-port-tube';
