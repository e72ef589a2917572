/** Row of `workshop_settings`: one setting, its value as JSON. */
export interface WorkshopSettingTable {
  key: string;
  value_json: string;
  updated_by: number | null;
  updated_at: string;
}
