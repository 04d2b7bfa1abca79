import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/** An alert of a watched analysis (a new cluster, or an update when it rose by the step). */
export class Alert extends Model<InferAttributes<Alert>, InferCreationAttributes<Alert>> {
  declare id: CreationOptional<number>;
  declare watchedAnalysisId: number;
  declare runAnalysisId: number;
  declare watchRunId: number;
  declare parentAlertId: number | null;
  declare kind: "new" | "update";
  declare datasetId: number;
  declare datasetVersion: number;
  declare raDeg: number;
  declare decDeg: number;
  declare lDeg: number;
  declare bDeg: number;
  declare radiusDeg: number;
  declare energyThresholdEeV: number | null;
  declare nOn: number;
  declare nExpected: number;
  declare localSigma: number;
  declare postTrialP: number;
  declare postTrialPUpperBound: number | null;
  declare postTrialSigma: number | null;
  declare postTrialSigmaLowerBound: number | null;
  declare nSkies: number;
  declare trialsCounted: string;
  declare previousLocalSigma: number | null;
  declare previousAnnouncedSigma: number | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof Alert {
    Alert.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        watchedAnalysisId: { type: DataTypes.INTEGER, allowNull: false, field: "watched_analysis_id" },
        runAnalysisId: { type: DataTypes.INTEGER, allowNull: false, field: "run_analysis_id" },
        watchRunId: { type: DataTypes.INTEGER, allowNull: false, field: "watch_run_id" },
        parentAlertId: { type: DataTypes.INTEGER, allowNull: true, field: "parent_alert_id" },
        kind: { type: DataTypes.ENUM("new", "update"), allowNull: false },
        datasetId: { type: DataTypes.INTEGER, allowNull: false, field: "dataset_id" },
        datasetVersion: { type: DataTypes.INTEGER, allowNull: false, field: "dataset_version" },
        raDeg: { type: DataTypes.DOUBLE, allowNull: false, field: "ra_deg" },
        decDeg: { type: DataTypes.DOUBLE, allowNull: false, field: "dec_deg" },
        lDeg: { type: DataTypes.DOUBLE, allowNull: false, field: "l_deg" },
        bDeg: { type: DataTypes.DOUBLE, allowNull: false, field: "b_deg" },
        radiusDeg: { type: DataTypes.DOUBLE, allowNull: false, field: "radius_deg" },
        energyThresholdEeV: { type: DataTypes.DOUBLE, allowNull: true, field: "energy_threshold_eev" },
        nOn: { type: DataTypes.INTEGER, allowNull: false, field: "n_on" },
        nExpected: { type: DataTypes.DOUBLE, allowNull: false, field: "n_expected" },
        localSigma: { type: DataTypes.DOUBLE, allowNull: false, field: "local_sigma" },
        postTrialP: { type: DataTypes.DOUBLE, allowNull: false, field: "post_trial_p" },
        postTrialPUpperBound: { type: DataTypes.DOUBLE, allowNull: true, field: "post_trial_p_upper_bound" },
        postTrialSigma: { type: DataTypes.DOUBLE, allowNull: true, field: "post_trial_sigma" },
        postTrialSigmaLowerBound: { type: DataTypes.DOUBLE, allowNull: true, field: "post_trial_sigma_lower_bound" },
        nSkies: { type: DataTypes.INTEGER, allowNull: false, field: "n_skies" },
        trialsCounted: { type: DataTypes.TEXT, allowNull: false, field: "trials_counted" },
        previousLocalSigma: { type: DataTypes.DOUBLE, allowNull: true, field: "previous_local_sigma" },
        previousAnnouncedSigma: { type: DataTypes.DOUBLE, allowNull: true, field: "previous_announced_sigma" },
        createdAt: { type: DataTypes.DATE, field: "created_at" },
      },
      { sequelize, tableName: "alerts", underscored: true, updatedAt: false },
    );
    return Alert;
  }
}
