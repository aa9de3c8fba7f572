"""Chart endpoints: properties, designs, sweeps and section pictures."""
