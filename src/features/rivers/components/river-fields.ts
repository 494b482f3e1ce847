/** Labels, units, allowed ranges and a one-line help for each river setting (ranges as in shared/schemas/river.ts). */
export interface RiverField {
  name:
    | 'mouthLongitude'
    | 'mouthLatitude'
    | 'outflowAzimuthDeg'
    | 'mouthWidth'
    | 'mouthDepth'
    | 'shelfSlope'
    | 'riverSalinity'
    | 'riverTemperature'
    | 'seaSalinity'
    | 'seaTemperature'
    | 'alongshoreShare'
    | 'nearFieldFreshwaterFraction'
    | 'entrainmentCoefficient'
    | 't90DayHours'
    | 't90NightHours'
    | 'daylightFraction';
  label: string;
  unit: string;
  range: string;
  help: string;
  step: string;
}

export const FIELD_GROUPS: { title: string; fields: RiverField[] }[] = [
  {
    title: 'The mouth',
    fields: [
      { name: 'mouthLatitude', label: 'Latitude of the mouth', unit: '°', range: '−90 to 90', help: 'North positive; sets how strongly the Earth’s rotation turns the plume.', step: '0.0001' },
      { name: 'mouthLongitude', label: 'Longitude of the mouth', unit: '°', range: '−180 to 180', help: 'East positive.', step: '0.0001' },
      { name: 'outflowAzimuthDeg', label: 'Direction of outflow', unit: '° from north', range: '0 to 360', help: 'Which way the river water leaves the mouth, clockwise from north (seaward).', step: '1' },
      { name: 'mouthWidth', label: 'Mouth width', unit: 'm', range: 'above 0, up to 100 000', help: 'Bank to bank where the river meets the sea.', step: '1' },
      { name: 'mouthDepth', label: 'Mouth depth', unit: 'm', range: 'above 0, up to 500', help: 'Typical depth of the channel at the mouth in flood.', step: '0.1' },
      { name: 'shelfSlope', label: 'Bottom slope off the mouth', unit: 'm/m', range: '0 to 0.5', help: 'Depth gained per metre offshore, e.g. 0.003 = 3 m per km; leave empty if unknown.', step: '0.0001' },
    ],
  },
  {
    title: 'River and sea water',
    fields: [
      { name: 'riverSalinity', label: 'River salinity in flood', unit: 'psu', range: '0 to 42', help: 'Flood water is nearly fresh (0 to 0.5).', step: '0.1' },
      { name: 'riverTemperature', label: 'River temperature in flood', unit: '°C', range: '−2 to 40', help: 'Water temperature at the mouth during floods.', step: '0.1' },
      { name: 'seaSalinity', label: 'Sea salinity', unit: 'psu', range: '0 to 42', help: 'Coastal water outside the plume; open coasts are near 33 to 35.', step: '0.1' },
      { name: 'seaTemperature', label: 'Sea temperature', unit: '°C', range: '−2 to 40', help: 'Surface water of the coast in the flood season.', step: '0.1' },
    ],
  },
  {
    title: 'Spreading and dilution',
    fields: [
      { name: 'alongshoreShare', label: 'Share of flow carried alongshore', unit: '', range: '0.3 to 1', help: 'Part of the discharge that leaves the bulge in the coastal current.', step: '0.05' },
      { name: 'nearFieldFreshwaterFraction', label: 'Freshwater fraction leaving the mouth', unit: '', range: '0.05 to 1', help: '1 = undiluted river water (the cautious bound); mixing near the mouth lowers it.', step: '0.05' },
      { name: 'entrainmentCoefficient', label: 'Entrainment coefficient', unit: '', range: '0.000001 to 0.001', help: 'How fast the coastal current takes in sea water. The river water share halves over (2/3) × current depth / (share at the mouth × coefficient), a distance that grows with flow; typically 0.00001 to 0.0001.', step: '0.000001' },
    ],
  },
  {
    title: 'Faecal indicator',
    fields: [
      { name: 't90DayHours', label: 'Daytime T90', unit: 'h', range: 'above 0, up to 10 000', help: 'Hours for 90 % of the indicator to die off in daylight.', step: '0.5' },
      { name: 't90NightHours', label: 'Night-time T90', unit: 'h', range: 'above 0, up to 10 000', help: 'Hours for 90 % to die off in the dark.', step: '0.5' },
      { name: 'daylightFraction', label: 'Daylight fraction', unit: '', range: '0 to 1', help: 'Share of the day in daylight (0.5 = 12 hours).', step: '0.05' },
    ],
  },
];
