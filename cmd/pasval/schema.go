package main

import (
	"io"

	"github.com/spf13/cobra"

	"pasval/internal/schema"
)

// SchemaFile is the file name the starter files point editors at.
const SchemaFile = "pasval-plant.schema.json"

func newSchemaCmd(stdout io.Writer) *cobra.Command {
	return &cobra.Command{
		Use:   "schema",
		Short: "Print the JSON Schema of the plant file, for editors",
		Long: `schema prints a JSON Schema (draft 2020-12) of the plant file: keys, types,
required fields, the arrangements, and quantities as "number unit" strings,
with descriptions. Save it beside your plant files as ` + SchemaFile + `;
files made by 'pasval init' start with the comment that tells a YAML language
server to use it:

  # yaml-language-server: $schema=` + SchemaFile + `

The schema checks structure only; 'pasval check' checks units, dimensions and
physics.` + "\n" + exitStatusHelp,
		Example: `  pasval schema > ` + SchemaFile,
		Args:    cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			return writeJSON(stdout, schema.PlantFile())
		},
	}
}
