import type { Sequelize } from 'sequelize';
import { AuditEvent } from './audit-event.js';
import { EngineFamily } from './engine-family.js';
import { Session } from './session.js';
import { Route, RouteStage, Stage } from './stage.js';
import { Station } from './station.js';
import { User } from './user.js';

export { AuditEvent, EngineFamily, Route, RouteStage, Session, Stage, Station, User };

export function initModels(sequelize: Sequelize) {
  for (const m of [User, Session, EngineFamily, Stage, Route, RouteStage, Station, AuditEvent]) {
    m.initModel(sequelize);
  }
  Station.belongsTo(Stage, { foreignKey: 'stageId', as: 'stage' });
  Session.belongsTo(User, { foreignKey: 'userId', as: 'user' });
  AuditEvent.belongsTo(User, { foreignKey: 'actorId', as: 'actor' });
  Route.belongsTo(EngineFamily, { foreignKey: 'engineFamilyId', as: 'family' });
  Route.hasMany(RouteStage, { foreignKey: 'routeId', as: 'steps' });
  RouteStage.belongsTo(Stage, { foreignKey: 'stageId', as: 'stage' });
}
