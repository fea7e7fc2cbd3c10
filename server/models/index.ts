import type { Sequelize } from 'sequelize';
import { AuditEvent } from './audit-event.js';
import { EngineFamily } from './engine-family.js';
import { Containment, ContainmentItem, Gauge, GaugeCalibration, GaugeStudy } from './gauges.js';
import { IdempotencyKey, MailOutbox } from './infra.js';
import { CoreReceipt, Item, ItemLink } from './items.js';
import { IssuedDocument } from './issued-document.js';
import { PartLot, UnitLot } from './lots.js';
import { UnitPreference } from './preferences.js';
import { Qualification } from './qualification.js';
import { StationTablet } from './station-tablet.js';
import { DefectCode, Nonconformance, NonconformanceTransition, Signature } from './nonconformances.js';
import { Customer, Supplier } from './parties.js';
import { FieldAction, PlantSettings } from './plant.js';
import { Attachment, LabelPrint, Shipment } from './records.js';
import { CauseCode, CoreCreditRevision, WarrantyClaim, WarrantyFinding } from './warranty.js';
import {
  CorrectiveAction,
  CorrectiveActionContainment,
  CorrectiveActionMember,
  CorrectiveActionSource,
  CorrectiveActionTask,
} from './corrective-action.js';
import { Reading, StageReentry, StageResult } from './results.js';
import { RecoveryCode } from './recovery-code.js';
import { Session } from './session.js';
import { RuleRehearsal, SpcLimits, SpcSignal } from './spc.js';
import { Characteristic, ToleranceRule } from './spec.js';
import { FamilyCastingNumber, PartKindRow, Route, RouteStage, Stage } from './stage.js';
import { ProcessImport } from './process-import.js';
import { CharacteristicVersion } from './characteristic-version.js';
import { Station } from './station.js';
import { User } from './user.js';

export {
  Attachment,
  AuditEvent,
  CauseCode,
  CoreCreditRevision,
  CorrectiveAction,
  CorrectiveActionContainment,
  CorrectiveActionMember,
  CorrectiveActionSource,
  CorrectiveActionTask,
  Characteristic,
  Containment,
  ContainmentItem,
  CoreReceipt,
  Customer,
  DefectCode,
  EngineFamily,
  FamilyCastingNumber,
  FieldAction,
  Gauge,
  GaugeCalibration,
  GaugeStudy,
  IdempotencyKey,
  IssuedDocument,
  Item,
  ItemLink,
  LabelPrint,
  MailOutbox,
  Nonconformance,
  NonconformanceTransition,
  PartKindRow,
  PartLot,
  PlantSettings,
  ProcessImport,
  CharacteristicVersion,
  Qualification,
  Reading,
  RecoveryCode,
  Route,
  RuleRehearsal,
  RouteStage,
  Session,
  Shipment,
  Signature,
  SpcLimits,
  SpcSignal,
  Stage,
  StageReentry,
  StageResult,
  Station,
  StationTablet,
  Supplier,
  ToleranceRule,
  UnitLot,
  UnitPreference,
  User,
  WarrantyClaim,
  WarrantyFinding,
};

const MODELS = [
  User,
  ProcessImport,
  CharacteristicVersion,
  Session,
  RecoveryCode,
  EngineFamily,
  PartKindRow,
  FamilyCastingNumber,
  Stage,
  Route,
  RouteStage,
  Station,
  Characteristic,
  ToleranceRule,
  Customer,
  Supplier,
  Item,
  CoreReceipt,
  ItemLink,
  PartLot,
  UnitLot,
  Gauge,
  GaugeCalibration,
  GaugeStudy,
  Containment,
  ContainmentItem,
  StageResult,
  Reading,
  StageReentry,
  DefectCode,
  Nonconformance,
  NonconformanceTransition,
  Signature,
  Attachment,
  LabelPrint,
  Shipment,
  IssuedDocument,
  WarrantyClaim,
  IdempotencyKey,
  MailOutbox,
  AuditEvent,
  PlantSettings,
  FieldAction,
  SpcLimits,
  SpcSignal,
  RuleRehearsal,
  CauseCode,
  WarrantyFinding,
  CoreCreditRevision,
  CorrectiveAction,
  CorrectiveActionSource,
  CorrectiveActionMember,
  CorrectiveActionContainment,
  CorrectiveActionTask,
  UnitPreference,
  Qualification,
  StationTablet,
] as const;

export function initModels(sequelize: Sequelize) {
  for (const m of MODELS) m.initModel(sequelize);

  Station.belongsTo(Stage, { foreignKey: 'stageId', as: 'stage' });
  Session.belongsTo(User, { foreignKey: 'userId', as: 'user' });
  AuditEvent.belongsTo(User, { foreignKey: 'actorId', as: 'actor' });
  Route.belongsTo(EngineFamily, { foreignKey: 'engineFamilyId', as: 'family' });
  Route.hasMany(RouteStage, { foreignKey: 'routeId', as: 'steps' });
  RouteStage.belongsTo(Stage, { foreignKey: 'stageId', as: 'stage' });

  // specification
  Characteristic.belongsTo(Stage, { foreignKey: 'stageId', as: 'stage' });
  Stage.hasMany(Characteristic, { foreignKey: 'stageId', as: 'characteristics' });
  ToleranceRule.belongsTo(Characteristic, { foreignKey: 'characteristicId', as: 'characteristic' });
  ToleranceRule.belongsTo(EngineFamily, { foreignKey: 'engineFamilyId', as: 'family' });
  ToleranceRule.belongsTo(User, { foreignKey: 'createdById', as: 'createdBy' });
  ToleranceRule.belongsTo(User, { foreignKey: 'approvedById', as: 'approvedBy' });
  Characteristic.hasMany(ToleranceRule, { foreignKey: 'characteristicId', as: 'rules' });

  // items and genealogy
  Item.belongsTo(EngineFamily, { foreignKey: 'engineFamilyId', as: 'family' });
  Item.belongsTo(Route, { foreignKey: 'routeId', as: 'route' });
  Item.belongsTo(Stage, { foreignKey: 'currentStageId', as: 'currentStage' });
  Item.belongsTo(User, { foreignKey: 'createdById', as: 'createdBy' });
  Item.hasOne(CoreReceipt, { foreignKey: 'itemId', as: 'receipt' });
  CoreReceipt.belongsTo(Item, { foreignKey: 'itemId', as: 'item' });
  CoreReceipt.belongsTo(Customer, { foreignKey: 'customerId', as: 'customer' });
  CoreReceipt.belongsTo(Supplier, { foreignKey: 'supplierId', as: 'supplier' });
  CoreReceipt.belongsTo(User, { foreignKey: 'receivedById', as: 'receivedBy' });
  ItemLink.belongsTo(Item, { foreignKey: 'parentItemId', as: 'parent' });
  ItemLink.belongsTo(Item, { foreignKey: 'childItemId', as: 'child' });
  ItemLink.belongsTo(User, { foreignKey: 'createdById', as: 'createdBy' });
  // seen from an item: links where it is the parent lead to its children, and the other way round
  Item.hasMany(ItemLink, { foreignKey: 'parentItemId', as: 'childLinks' });
  Item.hasMany(ItemLink, { foreignKey: 'childItemId', as: 'parentLinks' });

  // supplier lots
  PartLot.belongsTo(Supplier, { foreignKey: 'supplierId', as: 'supplier' });
  PartLot.hasMany(UnitLot, { foreignKey: 'partLotId', as: 'unitLots' });
  UnitLot.belongsTo(PartLot, { foreignKey: 'partLotId', as: 'partLot' });
  UnitLot.belongsTo(Item, { foreignKey: 'unitItemId', as: 'unit' });
  UnitLot.belongsTo(User, { foreignKey: 'createdById', as: 'createdBy' });
  Item.hasMany(UnitLot, { foreignKey: 'unitItemId', as: 'unitLots' });

  // gauges
  Gauge.hasMany(GaugeCalibration, { foreignKey: 'gaugeId', as: 'calibrations' });
  GaugeCalibration.belongsTo(Gauge, { foreignKey: 'gaugeId', as: 'gauge' });
  GaugeCalibration.belongsTo(User, { foreignKey: 'recordedById', as: 'recordedBy' });
  GaugeStudy.belongsTo(Gauge, { foreignKey: 'gaugeId', as: 'gauge' });
  GaugeStudy.belongsTo(User, { foreignKey: 'recordedById', as: 'recordedBy' });
  ContainmentItem.belongsTo(Containment, { foreignKey: 'containmentId', as: 'containment' });

  // results
  StageResult.belongsTo(Item, { foreignKey: 'itemId', as: 'item' });
  StageResult.belongsTo(Stage, { foreignKey: 'stageId', as: 'stage' });
  StageResult.belongsTo(Station, { foreignKey: 'stationId', as: 'station' });
  StageResult.belongsTo(User, { foreignKey: 'operatorId', as: 'operator' });
  StageResult.belongsTo(Gauge, { foreignKey: 'gaugeId', as: 'gauge' });
  StageResult.belongsTo(User, { foreignKey: 'reentryById', as: 'reentryBy' });
  StageResult.belongsTo(StageResult, { foreignKey: 'supersedesId', as: 'supersedes' });
  StageResult.hasOne(StageResult, { foreignKey: 'supersedesId', as: 'supersededBy' });
  StageResult.hasMany(Reading, { foreignKey: 'stageResultId', as: 'readings' });
  Item.hasMany(StageResult, { foreignKey: 'itemId', as: 'results' });
  Reading.belongsTo(StageResult, { foreignKey: 'stageResultId', as: 'stageResult' });
  Reading.belongsTo(Characteristic, { foreignKey: 'characteristicId', as: 'characteristic' });
  Reading.belongsTo(ToleranceRule, { foreignKey: 'toleranceRuleId', as: 'rule' });
  Reading.belongsTo(Gauge, { foreignKey: 'gaugeId', as: 'gauge' });

  // nonconformances
  Nonconformance.belongsTo(Item, { foreignKey: 'itemId', as: 'item' });
  Nonconformance.belongsTo(PartLot, { foreignKey: 'partLotId', as: 'partLot' });
  Nonconformance.belongsTo(StageResult, { foreignKey: 'stageResultId', as: 'stageResult' });
  Nonconformance.belongsTo(Stage, { foreignKey: 'stageId', as: 'stage' });
  Nonconformance.belongsTo(DefectCode, { foreignKey: 'defectCodeId', as: 'defectCode' });
  Nonconformance.belongsTo(Stage, { foreignKey: 'reworkStageId', as: 'reworkStage' });
  Nonconformance.belongsTo(User, { foreignKey: 'raisedById', as: 'raisedBy' });
  Nonconformance.belongsTo(User, { foreignKey: 'assigneeId', as: 'assignee' });
  Nonconformance.hasMany(NonconformanceTransition, { foreignKey: 'nonconformanceId', as: 'transitions' });
  NonconformanceTransition.belongsTo(Nonconformance, { foreignKey: 'nonconformanceId', as: 'nonconformance' });
  NonconformanceTransition.belongsTo(User, { foreignKey: 'actorId', as: 'actor' });
  Item.hasMany(Nonconformance, { foreignKey: 'itemId', as: 'nonconformances' });
  PartLot.hasMany(Nonconformance, { foreignKey: 'partLotId', as: 'nonconformances' });
  Signature.belongsTo(User, { foreignKey: 'userId', as: 'user' });

  // records
  Attachment.belongsTo(User, { foreignKey: 'uploadedById', as: 'uploadedBy' });
  LabelPrint.belongsTo(Item, { foreignKey: 'itemId', as: 'item' });
  LabelPrint.belongsTo(User, { foreignKey: 'printedById', as: 'printedBy' });
  Item.hasMany(LabelPrint, { foreignKey: 'itemId', as: 'labelPrints' });
  Shipment.belongsTo(Item, { foreignKey: 'unitItemId', as: 'unit' });
  Shipment.belongsTo(Customer, { foreignKey: 'customerId', as: 'customer' });
  Shipment.belongsTo(User, { foreignKey: 'releasedById', as: 'releasedBy' });
  Item.hasMany(Shipment, { foreignKey: 'unitItemId', as: 'shipments' });
  WarrantyClaim.belongsTo(Item, { foreignKey: 'unitItemId', as: 'unit' });
  WarrantyClaim.belongsTo(User, { foreignKey: 'openedById', as: 'openedBy' });
  WarrantyClaim.belongsTo(Shipment, { foreignKey: 'shipmentId', as: 'shipment' });
  WarrantyClaim.belongsTo(Customer, { foreignKey: 'customerId', as: 'customer' });
  WarrantyClaim.hasMany(WarrantyFinding, { foreignKey: 'claimId', as: 'findings' });
  Item.hasMany(WarrantyClaim, { foreignKey: 'unitItemId', as: 'warrantyClaims' });
  WarrantyFinding.belongsTo(CauseCode, { foreignKey: 'causeCodeId', as: 'causeCode' });
  CoreCreditRevision.belongsTo(User, { foreignKey: 'revisedById', as: 'revisedBy' });
  CorrectiveAction.hasMany(CorrectiveActionTask, { foreignKey: 'correctiveActionId', as: 'tasks' });

  FieldAction.belongsTo(Shipment, { foreignKey: 'shipmentId', as: 'shipment' });
  FieldAction.belongsTo(Item, { foreignKey: 'unitItemId', as: 'unit' });
  FieldAction.belongsTo(Nonconformance, { foreignKey: 'nonconformanceId', as: 'nonconformance' });
  FieldAction.belongsTo(User, { foreignKey: 'decidedById', as: 'decidedBy' });

  IdempotencyKey.belongsTo(User, { foreignKey: 'userId', as: 'user' });
}
