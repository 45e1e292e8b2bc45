declare module "convert-units" {
  type Converter = { from(unit: string): { to(unit: string): number } };
  export default function convert(value: number): Converter;
}
