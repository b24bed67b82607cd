import { DataTypes, Model } from 'sequelize'
import type {
  CreationOptional,
  InferAttributes,
  InferCreationAttributes,
  InitOptions,
  ModelAttributes,
  ModelStatic,
  Sequelize,
} from 'sequelize'

/**
 * The base of every model: attributes and creation attributes both read from the class's own
 * `declare` fields, so a model states its columns once.
 */
export abstract class TableModel<M extends Model> extends Model<
  InferAttributes<M>,
  InferCreationAttributes<M>
> {}

/** A row with a generated uuid key and both timestamps, as most tables have. */
export abstract class RecordModel<M extends Model> extends TableModel<M> {
  declare id: CreationOptional<string>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

/**
 * A uuid primary key the app generates. A new object each call: Sequelize writes the model
 * and field name into a column's definition, so two models must not share one.
 */
export const uuidKey = () => ({
  type: DataTypes.UUID,
  defaultValue: DataTypes.UUIDV4,
  primaryKey: true,
})

/**
 * Options every model shares: camelCase attributes stored in snake_case columns.
 * @param extra e.g. `{ timestamps: false }` for a table without `created_at`/`updated_at`
 */
export function tableOptions<M extends Model>(
  sequelize: Sequelize,
  tableName: string,
  extra: Omit<InitOptions<M>, 'sequelize' | 'tableName'> = {},
): InitOptions<M> {
  return { sequelize, tableName, underscored: true, ...extra }
}

/**
 * Describes a RecordModel's table: the uuid key, the model's own columns, then `created_at`
 * and `updated_at`. The migrations define the table; this only tells Sequelize about it.
 */
export function initRecord<M extends RecordModel<M>>(
  model: ModelStatic<M>,
  sequelize: Sequelize,
  tableName: string,
  columns: Omit<ModelAttributes<M, InferAttributes<M>>, 'id' | 'createdAt' | 'updatedAt'>,
): void {
  const attributes = {
    id: uuidKey(),
    ...columns,
    createdAt: DataTypes.DATE,
    updatedAt: DataTypes.DATE,
  } as ModelAttributes<M, InferAttributes<M>>
  model.init(attributes, tableOptions(sequelize, tableName))
}
