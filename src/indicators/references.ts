/**
 * One bibliography for the indicator formulas. Doc comments elsewhere cite these by short key.
 * Web pages without a printed date are marked `year: 'n.d.'`.
 */
export interface Reference {
  readonly author: string;
  readonly year: number | 'n.d.';
  readonly title: string;
  /** Journal with volume:pages, or the report series / publisher. */
  readonly journal: string;
}

export const REFERENCES = {
  rothfusz1990: {
    author: 'Rothfusz, L.P.',
    year: 1990,
    title: 'The heat index "equation" (or, more than you ever wanted to know about heat index)',
    journal: 'NWS Southern Region Technical Attachment SR 90-23',
  },
  nwsWpcHeatIndex: {
    author: 'NOAA National Weather Service, Weather Prediction Center',
    year: 'n.d.',
    title: 'The Heat Index Equation',
    journal: 'web page (algorithm with the simple formula and the low/high-humidity adjustments)',
  },
  steadman1979: {
    author: 'Steadman, R.G.',
    year: 1979,
    title: 'The assessment of sultriness. Part I: A temperature-humidity index based on human physiology and clothing science',
    journal: 'Journal of Applied Meteorology 18:861-873',
  },
  mastertonRichardson1979: {
    author: 'Masterton, J.M.; Richardson, F.A.',
    year: 1979,
    title: 'Humidex: a method of quantifying human discomfort due to excessive heat and humidity',
    journal: 'Environment Canada, Atmospheric Environment Service, CLI 1-79',
  },
  steadman1994: {
    author: 'Steadman, R.G.',
    year: 1994,
    title: 'Norms of apparent temperature in Australia',
    journal: 'Australian Meteorological Magazine 43:1-16',
  },
  bomThermalComfort: {
    author: 'Australian Bureau of Meteorology',
    year: 'n.d.',
    title: 'Thermal comfort observations (apparent temperature and approximate WBGT formulas)',
    journal: 'web page',
  },
  acsm1984: {
    author: 'American College of Sports Medicine',
    year: 1984,
    title: 'Prevention of thermal injuries during distance running (position stand)',
    journal: 'Medicine and Science in Sports and Exercise 16(5):ix-xiv',
  },
  alduchovEskridge1996: {
    author: 'Alduchov, O.A.; Eskridge, R.E.',
    year: 1996,
    title: 'Improved Magnus form approximation of saturation vapor pressure',
    journal: 'Journal of Applied Meteorology 35:601-609',
  },
  bolton1980: {
    author: 'Bolton, D.',
    year: 1980,
    title: 'The computation of equivalent potential temperature',
    journal: 'Monthly Weather Review 108:1046-1053',
  },
  sonntag1990: {
    author: 'Sonntag, D.',
    year: 1990,
    title:
      'Important new values of the physical constants of 1986, vapour pressure formulations based on the ITS-90, and psychrometer formulae',
    journal: 'Zeitschrift für Meteorologie 40:340-344 (Magnus constants as adopted by WMO)',
  },
  nairnFawcett2015: {
    author: 'Nairn, J.R.; Fawcett, R.J.B.',
    year: 2015,
    title: 'The excess heat factor: a metric for heatwave intensity and its use in classifying heatwave severity',
    journal: 'International Journal of Environmental Research and Public Health 12:227-253',
  },
  nairnOstendorfBi2018: {
    author: 'Nairn, J.; Ostendorf, B.; Bi, P.',
    year: 2018,
    title: 'Performance of excess heat factor severity as a global heatwave health impact index',
    journal: 'International Journal of Environmental Research and Public Health 15:2494',
  },
  hyndmanFan1996: {
    author: 'Hyndman, R.J.; Fan, Y.',
    year: 1996,
    title: 'Sample quantiles in statistical packages',
    journal: 'The American Statistician 50:361-365',
  },
  detinova1962: {
    author: 'Detinova, T.S.',
    year: 1962,
    title: 'Age-grouping methods in Diptera of medical importance, with special reference to some vectors of malaria',
    journal: 'World Health Organization Monograph Series 47',
  },
  martens1997: {
    author: 'Martens, W.J.M.',
    year: 1997,
    title: 'Health impacts of climate change and ozone depletion: an eco-epidemiological modelling approach',
    journal: 'Universitaire Pers Maastricht (doctoral thesis)',
  },
  craigSnowLeSueur1999: {
    author: 'Craig, M.H.; Snow, R.W.; le Sueur, D.',
    year: 1999,
    title: 'A climate-based distribution model of malaria transmission in sub-Saharan Africa',
    journal: 'Parasitology Today 15(3):105-111',
  },
  mordecai2013: {
    author: 'Mordecai, E.A.; Paaijmans, K.P.; Johnson, L.R.; et al.',
    year: 2013,
    title: 'Optimal temperature for malaria transmission is dramatically lower than previously predicted',
    journal: 'Ecology Letters 16:22-30',
  },
  wmoGuide8: {
    author: 'World Meteorological Organization',
    year: 2018,
    title: 'Guide to Instruments and Methods of Observation, Volume I, Annex 4.B: formulae for the computation of measures of humidity',
    journal: 'WMO-No. 8 (edition and annex number from memory)',
  },
  briere1999: {
    author: 'Brière, J.-F.; Pracros, P.; Le Roux, A.-Y.; Pierre, J.-S.',
    year: 1999,
    title: 'A novel rate model of temperature-dependent development for arthropods',
    journal: 'Environmental Entomology 28:22-29',
  },
} as const satisfies Record<string, Reference>;

export type ReferenceKey = keyof typeof REFERENCES;
