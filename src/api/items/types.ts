export type { ItemJson, ItemPart, RouteStep } from '../../../shared/schemas/items';
