import type { Sequelize } from "sequelize";
import { Alert } from "./alert";
import { Analysis } from "./analysis";
import { AuditEntry } from "./audit-entry";
import { CoverageConfiguration } from "./coverage-configuration";
import { Dataset } from "./dataset";
import { Site } from "./site";
import { Subscription } from "./subscription";
import { User } from "./user";

export { Alert, Analysis, AuditEntry, CoverageConfiguration, Dataset, Site, Subscription, User };

/** Initialises every model on one connection, then sets up all associations in one place. */
export function initModels(sequelize: Sequelize) {
  User.initModel(sequelize);
  Site.initModel(sequelize);
  Dataset.initModel(sequelize);
  Analysis.initModel(sequelize);
  Subscription.initModel(sequelize);
  AuditEntry.initModel(sequelize);
  CoverageConfiguration.initModel(sequelize);
  Alert.initModel(sequelize);

  Site.hasMany(Dataset, { foreignKey: "siteId", as: "datasets" });
  Dataset.belongsTo(Site, { foreignKey: "siteId", as: "site" });
  User.hasMany(Dataset, { foreignKey: "ownerId", as: "datasets" });
  Dataset.belongsTo(User, { foreignKey: "ownerId", as: "owner" });
  Dataset.hasMany(Analysis, { foreignKey: "datasetId", as: "analyses" });
  Analysis.belongsTo(Dataset, { foreignKey: "datasetId", as: "dataset" });
  Analysis.belongsTo(User, { foreignKey: "ownerId", as: "owner" });
  User.hasMany(Subscription, { foreignKey: "userId", as: "subscriptions" });
  Subscription.belongsTo(User, { foreignKey: "userId", as: "user" });
  Subscription.belongsTo(Analysis, { foreignKey: "analysisId", as: "analysis" });
  AuditEntry.belongsTo(User, { foreignKey: "actorId", as: "actor" });
  CoverageConfiguration.belongsTo(User, { foreignKey: "ownerId", as: "owner" });
  Alert.belongsTo(Analysis, { foreignKey: "watchedAnalysisId", as: "watchedAnalysis" });

  return { User, Site, Dataset, Analysis, Subscription, AuditEntry, CoverageConfiguration, Alert };
}
