export type { CoreDetail, CoreReceipt, Duplicate, TeardownRecord } from '../../../shared/schemas/intake';
