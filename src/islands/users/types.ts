export interface ReferrerChoice {
  id: number;
  name: string;
  practice: string;
}
