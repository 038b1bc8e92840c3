package org.loopstand.plant.grid;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.loopstand.plant.site.SiteLoader;

class GridWithoutLoadNoiseTest {
    @Test
    void shouldSwitchOnlyTheLoadsNoiseOff() throws Exception {
        Grid shipped = SiteLoader.load(Path.of("..", "config", "sites", "demo-site.yaml"));
        // the shipped demo site's loads carry noise (6 and 4 MW)
        assertThat(shipped.loads()).extracting(LoadModel::noiseSigmaMw).containsExactly(6.0, 4.0);

        Grid quiet = shipped.withoutLoadNoise();

        assertThat(quiet.loads()).extracting(LoadModel::noiseSigmaMw).containsExactly(0.0, 0.0);
        assertThat(quiet.loads()).extracting(LoadModel::baseMw).containsExactly(1700.0, 1100.0);
        assertThat(quiet.loads()).extracting(LoadModel::noiseTauS)
                .containsExactlyElementsOf(shipped.loads().stream().map(LoadModel::noiseTauS).toList());
        assertThat(quiet.loads().get(0).dailyShapePu()).isEqualTo(shipped.loads().get(0).dailyShapePu());
        assertThat(quiet.units()).isEqualTo(shipped.units());
        assertThat(quiet.areas()).isEqualTo(shipped.areas());
        assertThat(quiet.siteId()).isEqualTo("demo-site");
    }
}
