// The invented demo scenario: public entry points.
export { generateDemoScenario, type DemoScenario, type DemoMast, type DemoCell, type DemoReading, type DemoBasemap } from './scenario';
export { DEMO_SEED, ISLAND_NAME, createIslandModel, isOnLand } from './geography';
export { getDemoElevationM, getDemoIsland, getIslandBounds, type GeoBounds } from './elevation';
export { DEMO_OPERATORS } from './network';
export { DEMO_ORIGIN, toGeo, toLocal } from './projection';
