import { DataTypes, Model, type Sequelize, type InferAttributes, type InferCreationAttributes, type CreationOptional } from 'sequelize';

// What the local catcher received; stands in for real inboxes outside production.
export class MailMessage extends Model<InferAttributes<MailMessage>, InferCreationAttributes<MailMessage>> {
  declare id: CreationOptional<number>;
  declare envelopeFrom: string | null;
  declare envelopeTo: string[];
  declare subject: string | null;
  declare textBody: string | null;
  declare raw: string;
  declare receivedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    MailMessage.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        envelopeFrom: DataTypes.TEXT,
        envelopeTo: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false },
        subject: DataTypes.TEXT,
        textBody: DataTypes.TEXT,
        raw: { type: DataTypes.TEXT, allowNull: false },
        receivedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'mail_messages', modelName: 'mailMessage', underscored: true, timestamps: false },
    );
  }
}
