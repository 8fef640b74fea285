export { filletedPolygon, polygon, type Corner } from './fillet';
export { circle, circleLoop, polygonRegion, rectangle, rectangleLoop, tube } from './basic';
export { angle, channel, hollowRectangle, iSection } from './sections';
