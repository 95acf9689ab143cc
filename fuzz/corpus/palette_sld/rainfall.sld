<?xml version="1.0" encoding="UTF-8"?>
<!-- Tarrowmere Basin atlas: mean annual rainfall raster style (invented demo data). -->
<StyledLayerDescriptor version="1.0.0" xmlns="http://www.opengis.net/sld" xmlns:ogc="http://www.opengis.net/ogc">
  <NamedLayer>
    <Name>rainfall</Name>
    <UserStyle>
      <Title>Mean annual rainfall, mm</Title>
      <FeatureTypeStyle>
        <Rule>
          <RasterSymbolizer>
            <ColorMap type="intervals">
              <ColorMapEntry color="#eef4e6" quantity="600" label="under 600"/>
              <ColorMapEntry color="#c4e0b8" quantity="800" label="600–800"/>
              <ColorMapEntry color="#8cc49a" quantity="1000" label="800–1000"/>
              <ColorMapEntry color="#4e9c80" quantity="1200" label="1000–1200"/>
              <ColorMapEntry color="#2a6c64" quantity="1500" label="1200–1500"/>
              <ColorMapEntry color="#163c40" quantity="2000" label="1500–2000"/>
              <ColorMapEntry color="#0c2026" quantity="2500" label="2000–2500"/>
              <ColorMapEntry color="#060e12" quantity="9999" label="over 2500"/>
            </ColorMap>
          </RasterSymbolizer>
        </Rule>
      </FeatureTypeStyle>
    </UserStyle>
  </NamedLayer>
</StyledLayerDescriptor>
